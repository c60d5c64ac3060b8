import { error, fail } from '@sveltejs/kit';
import { checkTransition } from '$lib/jobs/machine';
import { closedStates } from '$lib/jobs/states';
import { assignSchema, extraWorkSchema, transitionSchema } from '$lib/schemas/job';
import { echoValues, fieldErrors, formError } from '$lib/schemas/form';
import { requireRole } from '$lib/server/auth';
import { readForm, tooLargeMessage } from '$lib/server/request';
import { getJobCard } from '$lib/server/job-card-view';
import { addExtraWork, assignJob, listBays, listTechnicians } from '$lib/server/job-cards';
import { stateHistory, transitionFacts, transitionJob } from '$lib/server/jobs';
import { closedPhotoMessage, listIntakePhotos, storePhoto } from '$lib/server/photos';
import { listProcedures } from '$lib/server/procedures';
import { MAX_PHOTO_BYTES, isTooLarge } from '$lib/uploads/check';
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
	const [history, facts, technicians, bays, procedures, photos] = await Promise.all([
		stateHistory(user.shopId, card.job.id),
		transitionFacts(user.shopId, card.job.id),
		listTechnicians(user.shopId),
		listBays(user.shopId),
		listProcedures(user.shopId),
		listIntakePhotos(user.shopId, card.job.id)
	]);
	const from = card.job.state;
	return {
		card,
		history,
		technicians,
		bays,
		procedures,
		photos,
		canEdit: user.role !== 'foreman',
		actions: {
			hold: checkTransition(from, 'on_hold', facts, 'r').ok,
			cancel: checkTransition(from, 'cancelled', facts, 'r').ok,
			resumeTo: from === 'on_hold' && facts.heldFrom ? facts.heldFrom : null
		}
	};
};

export const actions = {
	/** Intake photos: the Bench's rules (type from the bytes, at most 10 MB each). */
	photo: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const card = await cardOr404(user.shopId, params.number);
		if (closedStates.includes(card.job.state)) {
			return fail(409, { action: 'photo', errors: formError(closedPhotoMessage) });
		}
		let form: FormData;
		try {
			form = await request.formData();
		} catch (e) {
			if (isTooLarge(e)) {
				return fail(413, { action: 'photo', errors: formError(tooLargeMessage) });
			}
			return fail(400, { action: 'photo', errors: formError('Choose one or more photos to add.') });
		}
		const files = form.getAll('photo').filter((f): f is File => f instanceof File && f.size > 0);
		if (files.length === 0) {
			return fail(400, { action: 'photo', errors: formError('Choose one or more photos to add.') });
		}
		const refused: string[] = [];
		let added = 0;
		for (const file of files.slice(0, 12)) {
			if (file.size > MAX_PHOTO_BYTES) {
				refused.push(`${file.name}: larger than 10 MB.`);
				continue;
			}
			const bytes = new Uint8Array(await file.arrayBuffer());
			const result = await storePhoto(
				{ shopId: user.shopId, jobId: card.job.id, entryId: null, uploadedBy: user.id },
				{ bytes, name: file.name }
			);
			if (result.ok) added += 1;
			else refused.push(`${file.name}: ${result.message}`);
		}
		if (refused.length > 0) {
			const kept = added > 0 ? ` ${added} photo${added === 1 ? ' was' : 's were'} added.` : '';
			return fail(400, {
				action: 'photo',
				errors: formError(`Not added — ${refused.join(' ')}${kept}`)
			});
		}
		return { action: 'photo', done: `${added} intake photo${added === 1 ? '' : 's'} added.` };
	},
	state: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const card = await cardOr404(user.shopId, params.number);
		const form = await readForm(request);
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
		const form = await readForm(request);
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
		const form = await readForm(request);
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
