import { error, fail } from '@sveltejs/kit';
import { procedureEditors, procedureReaders } from '$lib/procedures/access';
import {
	procedureFormSchema,
	stepFormSchema,
	stepIdSchema,
	stepMoveSchema
} from '$lib/schemas/procedure';
import { echoValues, fieldErrors, formError } from '$lib/schemas/form';
import { isUuid } from '$lib/ids';
import { requireRole } from '$lib/server/auth';
import { readForm } from '$lib/server/request';
import { listParts } from '$lib/server/price-list';
import * as procedures from '$lib/server/procedures';
import type { Actions, PageServerLoad } from './$types';

async function procedureOr404(shopId: string, id: string) {
	if (!isUuid(id)) error(404, 'No such procedure.');
	const p = await procedures.getProcedure(shopId, id);
	if (!p) error(404, 'No such procedure in this shop.');
	return p;
}

export const load: PageServerLoad = async ({ params }) => {
	const user = requireRole(...procedureReaders);
	const procedure = await procedureOr404(user.shopId, params.id);
	return {
		procedure,
		parts: await listParts(user.shopId),
		canEdit: procedureEditors.includes(user.role)
	};
};

export const actions = {
	details: async ({ request, params }) => {
		const user = requireRole(...procedureEditors);
		await procedureOr404(user.shopId, params.id);
		const form = await readForm(request);
		const parsed = procedureFormSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success) {
			return fail(400, {
				action: 'details',
				values: echoValues(form),
				errors: fieldErrors(parsed.error)
			});
		}
		const ok = await procedures.updateProcedure(user.shopId, params.id, parsed.data);
		if (!ok) error(404, 'No such procedure in this shop.');
		return { action: 'details', done: 'Procedure saved.' };
	},
	step: async ({ request, params }) => {
		const user = requireRole(...procedureEditors);
		await procedureOr404(user.shopId, params.id);
		const form = await readForm(request);
		const values = echoValues(form);
		const parsed = stepFormSchema.safeParse(Object.fromEntries(form));
		const stepId = values.stepId || 'new';
		if (!parsed.success) {
			return fail(400, { action: 'step', stepId, values, errors: fieldErrors(parsed.error) });
		}
		const r = await procedures.saveStep(user.shopId, params.id, parsed.data);
		if (!r.ok) {
			return fail(400, { action: 'step', stepId, values, errors: formError(r.message, r.field) });
		}
		return { action: 'step', stepId, done: parsed.data.stepId ? 'Step saved.' : 'Step added.' };
	},
	deleteStep: async ({ request, params }) => {
		const user = requireRole(...procedureEditors);
		await procedureOr404(user.shopId, params.id);
		const parsed = stepIdSchema.safeParse(Object.fromEntries(await readForm(request)));
		if (!parsed.success)
			return fail(400, { action: 'deleteStep', errors: fieldErrors(parsed.error) });
		if (!(await procedures.deleteStep(user.shopId, params.id, parsed.data.stepId))) {
			return fail(404, { action: 'deleteStep', errors: formError('No such step.') });
		}
		return { action: 'deleteStep', done: 'Step removed from the library (jobs keep their copy).' };
	},
	move: async ({ request, params }) => {
		const user = requireRole(...procedureEditors);
		await procedureOr404(user.shopId, params.id);
		const parsed = stepMoveSchema.safeParse(Object.fromEntries(await readForm(request)));
		if (!parsed.success) return fail(400, { action: 'move', errors: fieldErrors(parsed.error) });
		await procedures.moveStep(user.shopId, params.id, parsed.data.stepId, parsed.data.direction);
		return { action: 'move', moved: parsed.data.stepId };
	}
} satisfies Actions;
