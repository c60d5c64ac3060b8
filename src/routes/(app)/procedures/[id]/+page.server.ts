import { error } from '@sveltejs/kit';
import { procedureEditors, procedureReaders } from '$lib/procedures/access';
import {
	procedureFormSchema,
	stepFormSchema,
	stepIdSchema,
	stepMoveSchema
} from '$lib/schemas/procedure';
import { echoValues } from '$lib/schemas/form';
import { failure } from '$lib/result';
import { isUuid } from '$lib/ids';
import { requireRole } from '$lib/server/auth';
import { refuse } from '$lib/server/http';
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
			return refuse(parsed.error, { action: 'details', values: echoValues(form) });
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
			return refuse(parsed.error, { action: 'step', stepId, values });
		}
		const r = await procedures.saveStep(user.shopId, params.id, parsed.data);
		if (!r.ok) return refuse(r, { action: 'step', stepId, values });
		return { action: 'step', stepId, done: parsed.data.stepId ? 'Step saved.' : 'Step added.' };
	},
	deleteStep: async ({ request, params }) => {
		const user = requireRole(...procedureEditors);
		await procedureOr404(user.shopId, params.id);
		const parsed = stepIdSchema.safeParse(Object.fromEntries(await readForm(request)));
		if (!parsed.success) return refuse(parsed.error, { action: 'deleteStep' });
		if (!(await procedures.deleteStep(user.shopId, params.id, parsed.data.stepId))) {
			return refuse(failure('not_found', 'No such step.'), { action: 'deleteStep' });
		}
		return { action: 'deleteStep', done: 'Step removed from the library (jobs keep their copy).' };
	},
	move: async ({ request, params }) => {
		const user = requireRole(...procedureEditors);
		await procedureOr404(user.shopId, params.id);
		const parsed = stepMoveSchema.safeParse(Object.fromEntries(await readForm(request)));
		if (!parsed.success) return refuse(parsed.error, { action: 'move' });
		await procedures.moveStep(user.shopId, params.id, parsed.data.stepId, parsed.data.direction);
		return { action: 'move', moved: parsed.data.stepId };
	}
} satisfies Actions;
