import { error } from '@sveltejs/kit';
import { checkTransition } from '$lib/jobs/machine';
import { closedStates } from '$lib/jobs/states';
import { assignSchema, extraWorkSchema, transitionSchema } from '$lib/schemas/job';
import { echoValues } from '$lib/schemas/form';
import { failure, type FailureKind } from '$lib/result';
import { requireRole } from '$lib/server/auth';
import { refuse } from '$lib/server/http';
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

const noPhotos = 'Choose one or more photos to add.';

export const actions = {
	/** Intake photos: the Bench's rules (type from the bytes, at most 10 MB each). */
	photo: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const card = await cardOr404(user.shopId, params.number);
		if (closedStates.includes(card.job.state)) {
			return refuse(failure('conflict', closedPhotoMessage), { action: 'photo' });
		}
		let form: FormData;
		try {
			form = await request.formData();
		} catch (e) {
			const why = isTooLarge(e)
				? failure('too_large', tooLargeMessage)
				: failure('invalid', noPhotos);
			return refuse(why, { action: 'photo' });
		}
		const files = form.getAll('photo').filter((f): f is File => f instanceof File && f.size > 0);
		if (files.length === 0) return refuse(failure('invalid', noPhotos), { action: 'photo' });
		const refused: string[] = [];
		// A closed record refuses every photo alike: it decides the status of the answer.
		let kind: FailureKind = 'invalid';
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
			else {
				refused.push(`${file.name}: ${result.message}`);
				if (result.kind === 'conflict') kind = 'conflict';
			}
		}
		if (refused.length > 0) {
			const kept = added > 0 ? ` ${added} photo${added === 1 ? ' was' : 's were'} added.` : '';
			return refuse(failure(kind, `Not added — ${refused.join(' ')}${kept}`), { action: 'photo' });
		}
		return { action: 'photo', done: `${added} intake photo${added === 1 ? '' : 's'} added.` };
	},
	state: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const card = await cardOr404(user.shopId, params.number);
		const form = await readForm(request);
		const parsed = transitionSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success) {
			return refuse(parsed.error, { action: 'state', values: echoValues(form) });
		}
		// Hold, resume and cancel only: the other moves belong to the Bench, Floor and invoices.
		const { to, reason, expectedFrom } = parsed.data;
		const resume = card.job.state === 'on_hold' && to !== 'cancelled';
		if (!resume && to !== 'on_hold' && to !== 'cancelled') {
			const elsewhere = 'That change is made elsewhere (Bench, Floor or the invoice).';
			return refuse(failure('invalid', elsewhere), { action: 'state', values: echoValues(form) });
		}
		const result = await transitionJob(user.shopId, card.job.id, to, {
			byUserId: user.id,
			reason,
			expectedFrom
		});
		if (!result.ok) {
			return refuse({ ...result, field: 'reason' }, { action: 'state', values: echoValues(form) });
		}
		return { action: 'state', done: 'State changed.' };
	},
	assign: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const card = await cardOr404(user.shopId, params.number);
		const form = await readForm(request);
		const parsed = assignSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success) {
			return refuse(parsed.error, { action: 'assign', values: echoValues(form) });
		}
		const result = await assignJob(user.shopId, card.job.id, parsed.data);
		if (!result.ok) return refuse(result, { action: 'assign', values: echoValues(form) });
		return { action: 'assign', done: 'Assignment saved.' };
	},
	extra: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const card = await cardOr404(user.shopId, params.number);
		const form = await readForm(request);
		const parsed = extraWorkSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success) {
			return refuse(parsed.error, { action: 'extra', values: echoValues(form) });
		}
		const result = await addExtraWork(user.shopId, user.id, card.job.id, parsed.data);
		if (!result.ok) return refuse(result, { action: 'extra', values: echoValues(form) });
		return { action: 'extra', done: 'Approval recorded and the procedure added to the job.' };
	}
} satisfies Actions;
