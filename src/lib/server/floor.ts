// The Floor's data: the running log, the out-of-spec queue, redo orders, final inspection and
// sign-off. Every query is scoped by the caller's shop id. The log stays append-only: an accept,
// a redo, an inspection tick and a sign-off are all new entries.
import { error } from '@sveltejs/kit';
import { and, eq, isNull, sql } from 'drizzle-orm';
import type { FloorEntry, LogFilter, OpenRedo, Verdict } from '$lib/floor/log';
import { isUuid } from '$lib/ids';

export type { OpenRedo };
import { activeStates, type JobState } from '$lib/jobs/states';
import { announceEntry } from './announce';
import { db } from './db';
import { isClosedRecord } from './db/errors';
import { readJson } from './request';
import * as s from './db/schema';
import {
	entryColumns,
	entryJoins,
	logPageSql,
	openOutOfSpecCountSql,
	openOutOfSpecSql
} from './floor-sql';
import { listJobs, transitionJob } from './jobs';
import { isLive } from './log/live';

export interface Actor {
	id: string;
	shopId: string;
	name: string;
}

import { RESCAN_WINDOW } from '$lib/floor/resume';

export { RESCAN_WINDOW };
export const PAGE_SIZE = 50;

function toEntry(r: Record<string, unknown>): FloorEntry {
	return {
		id: r.id as string,
		seq: Number(r.seq),
		jobId: r.job_id as string,
		jobNumber: Number(r.job_number),
		bay: (r.bay as string | null) ?? null,
		authorId: r.author_id as string,
		authorName: r.author_name as string,
		kind: r.kind as string,
		rawText: r.raw_text as string,
		value: r.value === null ? null : Number(r.value),
		unit: (r.unit as string | null) ?? null,
		specValue: r.spec_value === null ? null : Number(r.spec_value),
		specUnit: (r.spec_unit as string | null) ?? null,
		verdict: (r.verdict as Verdict | null) ?? null,
		note: (r.note as string | null) ?? null,
		stepLabel: (r.step_label as string | null) ?? null,
		retracts: (r.retracts as string | null) ?? null,
		respondsTo: (r.responds_to as string | null) ?? null,
		occurredAt: new Date(r.occurred_at as string).toISOString()
	};
}

/** A job id from the URL, or a 404 (a malformed id names no job). */
export function requireJobId(id: string): string {
	if (!isUuid(id)) error(404, 'No such job in this shop.');
	return id;
}

/** The JSON body of a request, or a 400 with a clear message. */
export function readJsonBody(request: Request): Promise<unknown> {
	return readJson(request, 'Send a JSON body.');
}

/**
 * One page of the running log, newest first; `before` is the seq of the oldest entry already
 * shown (keyset pagination: stable while new entries arrive).
 */
export async function listLog(
	shopId: string,
	filter: LogFilter,
	before?: number,
	limit = PAGE_SIZE
): Promise<{ entries: FloorEntry[]; more: boolean }> {
	const rows = await db.execute(logPageSql(shopId, filter, before, limit + 1));
	const entries = rows.slice(0, limit).map(toEntry);
	return { entries, more: rows.length > limit };
}

/**
 * Entries for a stream resuming after `afterSeq`, oldest first. Re-scans a window below it:
 * seq is taken at insert, so a transaction that commits late can carry a lower seq than an
 * entry already sent. The browser drops ids it already holds.
 */
export async function entriesSince(shopId: string, afterSeq: number, limit = 500) {
	const rows = await db.execute(sql`
		select ${entryColumns}
		from log_entry e ${entryJoins}
		where e.shop_id = ${shopId} and e.seq > ${Math.max(0, afterSeq - RESCAN_WINDOW)}
		order by e.seq asc
		limit ${limit}
	`);
	return rows.map(toEntry);
}

/** The newest seq of a shop's log (where a fresh stream starts). */
export async function latestSeq(shopId: string): Promise<number> {
	const [row] = await db.execute(
		sql`select coalesce(max(seq), 0) as seq from log_entry where shop_id = ${shopId}`
	);
	return Number(row.seq);
}

export async function entriesByIds(shopId: string, ids: string[]): Promise<FloorEntry[]> {
	if (ids.length === 0) return [];
	const rows = await db.execute(sql`
		select ${entryColumns}
		from log_entry e ${entryJoins}
		where e.shop_id = ${shopId} and e.id in (${sql.join(
			ids.map((id) => sql`${id}::uuid`),
			sql`, `
		)})
		order by e.seq asc
	`);
	return rows.map(toEntry);
}

// Every Floor stream of a shop reads each announced entry: five foremen, five reads of the same
// row within milliseconds. Reads in flight (and for a moment after) are shared, keyed by id.
const sharedReads = new Map<string, Promise<FloorEntry | null>>();
const keepReadMs = 2_000;

/** entriesByIds for the live streams: one query for the ids nobody in this process is reading. */
export async function announcedEntries(shopId: string, ids: string[]): Promise<FloorEntry[]> {
	const missing = ids.filter((id) => !sharedReads.has(`${shopId}:${id}`));
	if (missing.length > 0) {
		const read = entriesByIds(shopId, missing);
		for (const id of missing) {
			const key = `${shopId}:${id}`;
			const one = read.then((rows) => rows.find((r) => r.id === id) ?? null);
			sharedReads.set(key, one);
			// a failed read is not kept: the next stream asks again
			void one.then(
				() => setTimeout(() => sharedReads.delete(key), keepReadMs).unref?.(),
				() => sharedReads.delete(key)
			);
		}
	}
	const rows = await Promise.all(ids.map((id) => sharedReads.get(`${shopId}:${id}`)));
	return rows
		.filter((r): r is FloorEntry => r !== null && r !== undefined)
		.sort((a, b) => a.seq - b.seq);
}

/** Bays and technicians for the log's filters. */
export async function filterOptions(shopId: string) {
	const [shop] = await db.execute(sql`select bays from shop where id = ${shopId}`);
	const people = await db.execute(sql`
		select id, name from "user" where shop_id = ${shopId} and role in ('technician', 'foreman')
		order by name`);
	return {
		bays: (shop?.bays as string[] | undefined) ?? [],
		technicians: people.map((p) => ({ id: p.id as string, name: p.name as string }))
	};
}

// ——— The out-of-spec queue ———

export interface QueueItem {
	entryId: string;
	seq: number;
	jobId: string;
	jobNumber: number;
	bay: string | null;
	jobStepId: string;
	stepLabel: string;
	authorName: string;
	rawText: string;
	specValue: number | null;
	specUnit: string | null;
	/** The quantity's verdict: under or over, or in spec when only the grade fails. */
	verdict: Verdict;
	/** Why it waits: the value is under or over, or the fluid grade fails the step's spec. */
	reason: 'value' | 'grade';
	/** The fluid grade as called out, when the entry has one. */
	fluid: string | null;
	min: number | null;
	max: number | null;
	nominal: number | null;
	occurredAt: string;
}

/** Queue items per page: a queue of thousands is read a page at a time. */
export const QUEUE_PAGE = 100;

/** The whole queue of one job (a job holds few), or a page of the shop's queue. */
export async function listOutOfSpec(
	shopId: string,
	jobId?: string,
	page: { after?: number; limit?: number } = {}
): Promise<QueueItem[]> {
	const rows = await db.execute(openOutOfSpecSql(shopId, { jobId, ...page }));
	return rows.map((r) => ({
		entryId: r.id as string,
		seq: Number(r.seq),
		jobId: r.job_id as string,
		jobNumber: Number(r.job_number),
		bay: (r.bay as string | null) ?? null,
		jobStepId: r.job_step_id as string,
		stepLabel: r.step_label as string,
		authorName: r.author_name as string,
		rawText: r.raw_text as string,
		specValue: r.spec_value === null ? null : Number(r.spec_value),
		specUnit: (r.spec_unit as string | null) ?? null,
		verdict: r.verdict as Verdict,
		reason: r.verdict === 'low' || r.verdict === 'high' ? 'value' : 'grade',
		fluid: (r.fluid as string | null) ?? null,
		min: r.min === null ? null : Number(r.min),
		max: r.max === null ? null : Number(r.max),
		nominal: r.nominal === null ? null : Number(r.nominal),
		occurredAt: new Date(r.occurred_at as string).toISOString()
	}));
}

/** A page of the shop's queue (oldest first) and the size of the whole queue. */
export async function queuePage(shopId: string, after?: number, limit = QUEUE_PAGE) {
	const [items, [count]] = await Promise.all([
		listOutOfSpec(shopId, undefined, { after, limit: limit + 1 }),
		db.execute(openOutOfSpecCountSql(shopId))
	]);
	return {
		queue: items.slice(0, limit),
		queueTotal: Number(count.n),
		queueNextAfter: items.length > limit ? items[limit - 1].seq : null
	};
}

async function requireOpenItem(shopId: string, entryId: string): Promise<QueueItem> {
	if (!isUuid(entryId)) error(404, 'No such entry in this shop.');
	const [entry] = await db.execute(
		sql`select id, job_id from log_entry where id = ${entryId} and shop_id = ${shopId}`
	);
	if (!entry) error(404, 'No such entry in this shop.');
	const items = await listOutOfSpec(shopId, entry.job_id as string);
	const item = items.find((i) => i.entryId === entryId);
	if (!item) {
		error(
			409,
			'This entry is no longer waiting: it was answered already or a newer value was logged.'
		);
	}
	return item;
}

/** drizzle/0013 refused the entry: the job's record closed before it was written. */
function refuseClosed(err: unknown): never {
	if (isClosedRecord(err)) error(409, 'This job’s record is closed: it takes no more entries.');
	throw err;
}

async function appendEntry(values: typeof s.logEntry.$inferInsert) {
	const [row] = await db
		.insert(s.logEntry)
		.values(values)
		.returning({ id: s.logEntry.id, seq: s.logEntry.seq })
		.catch(refuseClosed);
	void announceEntry({
		seq: row.seq,
		id: row.id,
		shopId: values.shopId,
		jobId: values.jobId,
		kind: values.kind
	});
	return row.id;
}

/** Accepts an out-of-spec value with the foreman's reason (an `accept` entry answering it). */
export async function acceptEntry(actor: Actor, entryId: string, reason: string) {
	const item = await requireOpenItem(actor.shopId, entryId);
	return appendEntry({
		id: crypto.randomUUID(),
		shopId: actor.shopId,
		jobId: item.jobId,
		jobStepId: item.jobStepId,
		authorId: actor.id,
		kind: 'accept',
		rawText: `accepted: ${item.stepLabel}`,
		source: 'typed',
		note: reason,
		respondsTo: item.entryId,
		occurredAt: new Date()
	});
}

/**
 * Orders a redo of an out-of-spec step: a `redo` entry with the foreman's note. The step counts
 * as not done again until the technician logs a new entry for it.
 */
export async function orderRedo(actor: Actor, entryId: string, note: string) {
	const item = await requireOpenItem(actor.shopId, entryId);
	return appendEntry({
		id: crypto.randomUUID(),
		shopId: actor.shopId,
		jobId: item.jobId,
		jobStepId: item.jobStepId,
		authorId: actor.id,
		kind: 'redo',
		rawText: `redo: ${item.stepLabel}`,
		source: 'typed',
		note,
		respondsTo: item.entryId,
		occurredAt: new Date()
	});
}

/** Redo orders on a job whose step has no new entry since: what the Bench shows on top. */
export async function listOpenRedos(shopId: string, jobId: string): Promise<OpenRedo[]> {
	const rows = await db.execute(sql`
		select d.id, d.job_step_id, st.label as step_label, d.note, u.name as foreman_name,
			d.occurred_at, prev.raw_text as previous
		from log_entry d
		join job_step st on st.id = d.job_step_id
		join "user" u on u.id = d.author_id
		left join log_entry prev on prev.id = d.responds_to
		where d.shop_id = ${shopId} and d.job_id = ${jobId} and d.kind = 'redo'
		  and ${isLive('d')}
		  and not exists (
			select 1 from log_entry n
			where n.job_step_id = d.job_step_id and n.seq > d.seq
			  and n.kind in ('measure', 'done', 'part')
			  and ${isLive('n')}
		  )
		order by d.seq asc`);
	return rows.map((r) => ({
		id: r.id as string,
		jobStepId: r.job_step_id as string,
		stepLabel: r.step_label as string,
		note: (r.note as string | null) ?? '',
		foremanName: r.foreman_name as string,
		orderedAt: new Date(r.occurred_at as string).toISOString(),
		previous: (r.previous as string | null) ?? null
	}));
}

// ——— Final inspection and sign-off ———

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

export async function getInspection(shopId: string, jobId: string): Promise<InspectionState> {
	requireJobId(jobId);
	const [j] = await db.execute(sql`
		select j.id, j.number, j.state, j.bay, t.name as technician_name,
			nullif(trim(coalesce(v.make, '') || ' ' || coalesce(v.model, '')), '') as vehicle,
			v.registration, so.name as signed_off_by, j.signed_off_at
		from job j
		left join "user" t on t.id = j.technician_id
		left join "user" so on so.id = j.signed_off_by
		left join vehicle v on v.id = j.vehicle_id
		where j.id = ${jobId} and j.shop_id = ${shopId}`);
	if (!j) error(404, 'No such job in this shop.');
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
) {
	const state = await getInspection(actor.shopId, jobId);
	if (state.job.signedOffAt) error(409, 'This job is signed off: its checklist is closed.');
	const item = state.items.find((i) => i.id === itemId);
	if (!item) error(404, 'No such checklist item in this shop.');
	if (ticked === (item.tickedAt !== null)) return; // already as asked: a repeat changes nothing
	if (ticked) {
		await appendEntry({
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
		return;
	}
	const [tick] = await db.execute(sql`
		select e.id from log_entry e
		where e.job_id = ${jobId} and e.shop_id = ${actor.shopId} and e.kind = 'inspection'
		  and e.inspection_item_id = ${itemId}
		  and ${isLive('e')}
		order by e.seq desc limit 1`);
	await appendEntry({
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
export async function signOff(actor: Actor, jobId: string) {
	const state = await getInspection(actor.shopId, jobId);
	const blockers = signOffBlockers(state);
	if (blockers.length > 0) error(409, `Cannot sign off yet. ${blockers.join(' ')}`);
	const entry = await db.transaction(async (tx) => {
		const now = new Date();
		// The condition repeats the check inside the transaction so two foremen cannot both sign.
		const updated = await tx
			.update(s.job)
			.set({ signedOffBy: actor.id, signedOffAt: now })
			.where(and(eq(s.job.id, jobId), eq(s.job.shopId, actor.shopId), isNull(s.job.signedOffAt)))
			.returning({ id: s.job.id });
		if (updated.length === 0) error(409, 'The job is signed off already.');
		const [row] = await tx
			.insert(s.logEntry)
			.values({
				id: crypto.randomUUID(),
				shopId: actor.shopId,
				jobId,
				authorId: actor.id,
				kind: 'sign_off',
				rawText: 'signed off after final inspection',
				source: 'typed',
				occurredAt: now
			})
			.returning({ id: s.logEntry.id, seq: s.logEntry.seq })
			.catch(refuseClosed);
		return row;
	});
	void announceEntry({ ...entry, shopId: actor.shopId, jobId, kind: 'sign_off' });
}

/**
 * Why a job may not move to "ready to invoice" (empty when it may): it needs the foreman's
 * sign-off and no out-of-spec entry waiting for an answer.
 */
export async function readyToInvoiceBlockers(shopId: string, jobId: string): Promise<string[]> {
	const state = await getInspection(shopId, jobId);
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
export async function markReadyToInvoice(actor: Actor, jobId: string) {
	const blockers = await readyToInvoiceBlockers(actor.shopId, jobId);
	if (blockers.length > 0) error(409, `Not ready to invoice. ${blockers.join(' ')}`);
	const result = await transitionJob(actor.shopId, jobId, 'ready_to_invoice', {
		byUserId: actor.id,
		expectedFrom: 'final_inspection'
	});
	if (!result.ok) error(409, result.message);
}

// ——— The bay board ———

export type BoardJob = Awaited<ReturnType<typeof listJobs>>[number] & { openOutOfSpec: number };

/**
 * Every active job with its progress and open out-of-spec count, and the first page of the
 * queue (`queueAfter`: the seq of the last item of the page before).
 */
export async function floorBoard(shopId: string, queueAfter?: number) {
	const [jobs, queue] = await Promise.all([
		listJobs(shopId, { states: [...activeStates] }),
		queuePage(shopId, queueAfter)
	]);
	const board: BoardJob[] = jobs
		.map((j) => ({ ...j, openOutOfSpec: j.waiting }))
		.sort((a, b) => (a.bay ?? '~').localeCompare(b.bay ?? '~') || a.number - b.number);
	return { board, ...queue };
}
