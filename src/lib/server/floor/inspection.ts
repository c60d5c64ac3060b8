// Final inspection and sign-off on the Floor: the checklist (ticks are entries, unticks their
// retractions), what blocks a sign-off, the sign-off itself and the move to ready to invoice.
import { and, eq, isNull, sql } from 'drizzle-orm';
import type { OpenRedo } from '$lib/floor/log';
import { isUuid } from '$lib/ids';
import type { JobState } from '$lib/jobs/states';
import { failure, type Result } from '$lib/result';
import { db } from '../db';
import * as s from '../db/schema';
import { transitionJob } from '../jobs';
import { isLive } from '../log/live';
import { writeEntries } from '../log/write';
import type { Actor } from './log';
import { closedRecordMessage, listOpenRedos, listOutOfSpec, type QueueItem } from './queue';

export interface InspectionState {
	job: {
		id: string;
		number: number;
		state: JobState;
		bay: string | null;
		technicianName: string | null;
		vehicle: string | null;
		registration: string | null;
		signedOffBy: string | null;
		signedOffAt: string | null;
	};
	items: { id: string; label: string; tickedBy: string | null; tickedAt: string | null }[];
	openOutOfSpec: QueueItem[];
	openRedos: OpenRedo[];
}

export const noSuchJob = 'No such job in this shop.';

/** The job's final inspection; null when the shop has no such job. */
export async function getInspection(
	shopId: string,
	jobId: string
): Promise<InspectionState | null> {
	if (!isUuid(jobId)) return null;
	const [j] = await db.execute(sql`
		select j.id, j.number, j.state, j.bay, t.name as technician_name,
			nullif(trim(coalesce(v.make, '') || ' ' || coalesce(v.model, '')), '') as vehicle,
			v.registration, so.name as signed_off_by, j.signed_off_at
		from job j
		left join "user" t on t.id = j.technician_id
		left join "user" so on so.id = j.signed_off_by
		left join vehicle v on v.id = j.vehicle_id and v.shop_id = j.shop_id
		where j.id = ${jobId} and j.shop_id = ${shopId}`);
	if (!j) return null;
	// The latest live inspection entry per item decides whether it is ticked; an untick is a
	// retraction of the tick.
	const items = await db.execute(sql`
		select i.id, i.label, tick.author_name, tick.occurred_at
		from inspection_item i
		left join lateral (
			select u.name as author_name, e.occurred_at from log_entry e
			join "user" u on u.id = e.author_id
			where e.job_id = ${jobId} and e.shop_id = ${shopId} and e.kind = 'inspection'
			  and e.inspection_item_id = i.id
			  and ${isLive('e')}
			order by e.seq desc limit 1
		) tick on true
		-- A line the owner has since removed still shows where it was ticked on this job.
		where i.shop_id = ${shopId} and (i.active or tick.occurred_at is not null)
		order by i.position`);
	return {
		job: {
			id: j.id as string,
			number: Number(j.number),
			state: j.state as JobState,
			bay: (j.bay as string | null) ?? null,
			technicianName: (j.technician_name as string | null) ?? null,
			vehicle: (j.vehicle as string | null) ?? null,
			registration: (j.registration as string | null) ?? null,
			signedOffBy: (j.signed_off_by as string | null) ?? null,
			signedOffAt: j.signed_off_at ? new Date(j.signed_off_at as string).toISOString() : null
		},
		items: items.map((i) => ({
			id: i.id as string,
			label: i.label as string,
			tickedBy: (i.author_name as string | null) ?? null,
			tickedAt: i.occurred_at ? new Date(i.occurred_at as string).toISOString() : null
		})),
		openOutOfSpec: await listOutOfSpec(shopId, jobId),
		openRedos: await listOpenRedos(shopId, jobId)
	};
}

/** Ticks (an `inspection` entry) or unticks (a retraction of the tick) a checklist item. */
export async function setInspectionTick(
	actor: Actor,
	jobId: string,
	itemId: string,
	ticked: boolean
): Promise<Result> {
	const state = await getInspection(actor.shopId, jobId);
	if (!state) return failure('not_found', noSuchJob);
	if (state.job.signedOffAt) {
		return failure('conflict', 'This job is signed off: its checklist is closed.');
	}
	const item = state.items.find((i) => i.id === itemId);
	if (!item) return failure('not_found', 'No such checklist item in this shop.');
	if (ticked === (item.tickedAt !== null)) return { ok: true }; // a repeat changes nothing
	const written = await writeEntries(async (insert, tx) => {
		if (ticked) {
			return insert({
				id: crypto.randomUUID(),
				shopId: actor.shopId,
				jobId,
				authorId: actor.id,
				kind: 'inspection',
				rawText: `checked: ${item.label}`,
				source: 'typed',
				inspectionItemId: itemId,
				occurredAt: new Date()
			});
		}
		const [tick] = await tx.execute(sql`
			select e.id from log_entry e
			where e.job_id = ${jobId} and e.shop_id = ${actor.shopId} and e.kind = 'inspection'
			  and e.inspection_item_id = ${itemId}
			  and ${isLive('e')}
			order by e.seq desc limit 1`);
		return insert({
			id: crypto.randomUUID(),
			shopId: actor.shopId,
			jobId,
			authorId: actor.id,
			kind: 'retraction',
			rawText: `unchecked: ${item.label}`,
			source: 'typed',
			retracts: tick.id as string,
			occurredAt: new Date()
		});
	});
	return written.closed ? failure('conflict', closedRecordMessage) : { ok: true };
}

/** What stands between a job and sign-off (empty when it may be signed off). */
export function signOffBlockers(state: InspectionState): string[] {
	const out: string[] = [];
	if (state.job.signedOffAt) out.push('The job is signed off already.');
	if (state.job.state !== 'final_inspection') {
		out.push('The job is not in final inspection: the technician sends it there from the Bench.');
	}
	const open = state.items.filter((i) => !i.tickedAt).length;
	if (open > 0) out.push(`${open} checklist item${open === 1 ? '' : 's'} not ticked.`);
	const oos = state.openOutOfSpec.length;
	if (oos > 0) out.push(`${oos} out-of-spec entr${oos === 1 ? 'y' : 'ies'} waiting for an answer.`);
	const redos = state.openRedos.length;
	if (redos > 0) out.push(`${redos} redo${redos === 1 ? '' : 's'} not done yet.`);
	return out;
}

/** Signs the job off: who and when on the job card, and a `sign_off` entry in the log. */
export async function signOff(actor: Actor, jobId: string): Promise<Result> {
	const state = await getInspection(actor.shopId, jobId);
	if (!state) return failure('not_found', noSuchJob);
	const blockers = signOffBlockers(state);
	if (blockers.length > 0) {
		return failure('conflict', `Cannot sign off yet. ${blockers.join(' ')}`);
	}
	const written = await writeEntries(async (insert, tx) => {
		const now = new Date();
		// The condition repeats the check inside the transaction so two foremen cannot both sign.
		const updated = await tx
			.update(s.job)
			.set({ signedOffBy: actor.id, signedOffAt: now })
			.where(and(eq(s.job.id, jobId), eq(s.job.shopId, actor.shopId), isNull(s.job.signedOffAt)))
			.returning({ id: s.job.id });
		if (updated.length === 0) return false;
		await insert({
			id: crypto.randomUUID(),
			shopId: actor.shopId,
			jobId,
			authorId: actor.id,
			kind: 'sign_off',
			rawText: 'signed off after final inspection',
			source: 'typed',
			occurredAt: now
		});
		return true;
	});
	if (written.closed) return failure('conflict', closedRecordMessage);
	return written.value ? { ok: true } : failure('conflict', 'The job is signed off already.');
}

/**
 * Why a job may not move to "ready to invoice" (empty when it may): it needs the foreman's
 * sign-off and no out-of-spec entry waiting for an answer.
 */
export function readyToInvoiceBlockers(state: InspectionState): string[] {
	const out: string[] = [];
	if (!state.job.signedOffAt) out.push('The job has no sign-off after final inspection.');
	const oos = state.openOutOfSpec.length;
	if (oos > 0) out.push(`${oos} out-of-spec entr${oos === 1 ? 'y' : 'ies'} waiting for an answer.`);
	return out;
}

/**
 * Moves a signed-off job to "ready to invoice" through the Jobs state machine (transitionJob),
 * which records the change; the Floor's own check runs first for its clearer messages.
 */
export async function markReadyToInvoice(actor: Actor, jobId: string): Promise<Result> {
	const state = await getInspection(actor.shopId, jobId);
	if (!state) return failure('not_found', noSuchJob);
	const blockers = readyToInvoiceBlockers(state);
	if (blockers.length > 0) {
		return failure('conflict', `Not ready to invoice. ${blockers.join(' ')}`);
	}
	const moved = await transitionJob(actor.shopId, jobId, 'ready_to_invoice', {
		byUserId: actor.id,
		expectedFrom: 'final_inspection'
	});
	return moved.ok ? { ok: true } : failure('conflict', moved.message);
}
