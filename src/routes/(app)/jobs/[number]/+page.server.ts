import { error, fail } from '@sveltejs/kit';
import { checkTransition } from '$lib/jobs/machine';
import { assignSchema, extraWorkSchema, transitionSchema } from '$lib/schemas/job';
import { echoValues, fieldErrors, formError } from '$lib/schemas/form';
import { requireRole } from '$lib/server/auth';
import { db } from '$lib/server/db';
import {
	addExtraWork,
	assignJob,
	getJobCard,
	listBays,
	listTechnicians
} from '$lib/server/job-cards';
import { stateHistory, transitionFacts, transitionJob } from '$lib/server/jobs';
import { listProcedures } from '$lib/server/procedures';
import type { Actions, PageServerLoad } from './$types';

function jobNumber(raw: string): number {
	const n = Number(raw);
	if (!/^\d{1,9}$/.test(raw) || !Number.isSafeInteger(n)) error(404, 'No such job card.');
	return n;
}

async function cardOr404(shopId: string, raw: string) {
	const card = await getJobCard(shopId, jobNumber(raw));
	if (!card) error(404, 'No such job card in this shop.');
	return card;
}

export const load: PageServerLoad = async ({ params }) => {
	const user = requireRole('service_writer', 'owner', 'foreman');
	const card = await cardOr404(user.shopId, params.number);
	const [history, facts, technicians, bays, procedures] = await Promise.all([
		stateHistory(user.shopId, card.job.id),
		transitionFacts(db, user.shopId, card.job.id),
		listTechnicians(user.shopId),
		listBays(user.shopId),
		listProcedures(user.shopId)
	]);
	const from = card.job.state;
	return {
		card,
		history,
		technicians,
		bays,
		procedures,
		canEdit: user.role !== 'foreman',
		actions: {
			hold: checkTransition(from, 'on_hold', facts, 'r').ok,
			cancel: checkTransition(from, 'cancelled', facts, 'r').ok,
			resumeTo: from === 'on_hold' && facts.heldFrom ? facts.heldFrom : null
		}
	};
};

export const actions = {
	state: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const card = await cardOr404(user.shopId, params.number);
		const form = await request.formData();
		const parsed = transitionSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success) {
			return fail(400, {
				action: 'state',
				values: echoValues(form),
				errors: fieldErrors(parsed.error)
			});
		}
		// Hold, resume and cancel only: the other moves belong to the Bench, Floor and invoices.
		const { to, reason, expectedFrom } = parsed.data;
		const resume = card.job.state === 'on_hold' && to !== 'cancelled';
		if (!resume && to !== 'on_hold' && to !== 'cancelled') {
			return fail(400, {
				action: 'state',
				values: echoValues(form),
				errors: formError('That change is made elsewhere (Bench, Floor or the invoice).')
			});
		}
		const result = await transitionJob(user.shopId, card.job.id, to, {
			byUserId: user.id,
			reason,
			expectedFrom
		});
		if (!result.ok) {
			return fail(400, {
				action: 'state',
				values: echoValues(form),
				errors: formError(result.message, 'reason')
			});
		}
		return { action: 'state', done: 'State changed.' };
	},
	assign: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const card = await cardOr404(user.shopId, params.number);
		const form = await request.formData();
		const parsed = assignSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success) {
			return fail(400, {
				action: 'assign',
				values: echoValues(form),
				errors: fieldErrors(parsed.error)
			});
		}
		const result = await assignJob(user.shopId, card.job.id, parsed.data);
		if (!result.ok) {
			return fail(400, {
				action: 'assign',
				values: echoValues(form),
				errors: formError(result.message, result.field)
			});
		}
		return { action: 'assign', done: 'Assignment saved.' };
	},
	extra: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const card = await cardOr404(user.shopId, params.number);
		const form = await request.formData();
		const parsed = extraWorkSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success) {
			return fail(400, {
				action: 'extra',
				values: echoValues(form),
				errors: fieldErrors(parsed.error)
			});
		}
		const result = await addExtraWork(user.shopId, user.id, card.job.id, parsed.data);
		if (!result.ok) {
			return fail(400, {
				action: 'extra',
				values: echoValues(form),
				errors: formError(result.message)
			});
		}
		return { action: 'extra', done: 'Approval recorded and the procedure added to the job.' };
	}
} satisfies Actions;
