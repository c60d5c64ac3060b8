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
import { readJson } from './request';
import * as s from './db/schema';
import { driftStepSql, entryColumns, entryJoins, logPageSql } from './floor-sql';
import { listJobs, transitionJob } from './jobs';

export interface Actor {
	id: string;
	shopId: string;
	name: string;
}

import { RESCAN_WINDOW } from '$lib/floor/resume';

export { RESCAN_WINDOW };
export const PAGE_SIZE = 50;

/** Job states whose out-of-spec entries still need an answer. */
const openStates: JobState[] = [
	'open',
	'in_work',
	'final_inspection',
	'on_hold',
	'ready_to_invoice'
];

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

/**
 * Steps whose latest measurement (not retracted) is under or over, or whose fluid grade fails the
 * step's spec, and has no answer yet (an
 * accept or a redo responding to it). A new in-spec measurement of the step leaves the queue
 * empty for it; a new out-of-spec one is a new item.
 */
function openOutOfSpecSql(shopId: string, jobId?: string) {
	return sql`
		with latest as (
			select distinct on (e.job_step_id) e.*
			from log_entry e
			where e.shop_id = ${shopId} and e.kind = 'measure' and e.job_step_id is not null
			  ${jobId ? sql`and e.job_id = ${jobId}` : sql``}
			  and not exists (select 1 from log_entry r where r.retracts = e.id)
			order by e.job_step_id, e.seq desc
		)
		select e.id, e.seq, e.job_id, j.number as job_number, j.bay, e.job_step_id,
			st.label as step_label, u.name as author_name, e.raw_text, e.spec_value, e.spec_unit,
			e.verdict, e.fluid, e.fluid_verdict, st.min, st.max, st.nominal, e.occurred_at
		from latest e
		join job j on j.id = e.job_id
		join job_step st on st.id = e.job_step_id
		join "user" u on u.id = e.author_id
		where (e.verdict in ('low', 'high') or e.fluid_verdict = 'fails')
		  and j.state::text in (${sql.join(
				openStates.map((st) => sql`${st}`),
				sql`, `
			)})
		  and not exists (
			select 1 from log_entry a
			where a.responds_to = e.id and a.kind in ('accept', 'redo')
			  and not exists (select 1 from log_entry r where r.retracts = a.id)
		  )
		order by e.seq asc`;
}

export async function listOutOfSpec(shopId: string, jobId?: string): Promise<QueueItem[]> {
	const rows = await db.execute(openOutOfSpecSql(shopId, jobId));
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

async function appendEntry(values: typeof s.logEntry.$inferInsert) {
	const [row] = await db
		.insert(s.logEntry)
		.values(values)
		.returning({ id: s.logEntry.id, seq: s.logEntry.seq });
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
		  and not exists (select 1 from log_entry r where r.retracts = d.id)
		  and not exists (
			select 1 from log_entry n
			where n.job_step_id = d.job_step_id and n.seq > d.seq
			  and n.kind in ('measure', 'done', 'part')
			  and not exists (select 1 from log_entry r where r.retracts = n.id)
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
			  and not exists (select 1 from log_entry r where r.retracts = e.id)
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
		  and not exists (select 1 from log_entry r where r.retracts = e.id)
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
			.returning({ id: s.logEntry.id, seq: s.logEntry.seq });
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

/** Every active job with its progress and open out-of-spec count, and the queue itself. */
export async function floorBoard(shopId: string) {
	const [jobs, queue] = await Promise.all([
		listJobs(shopId, { states: [...activeStates] }),
		listOutOfSpec(shopId)
	]);
	const open: Record<string, number> = {};
	for (const item of queue) open[item.jobId] = (open[item.jobId] ?? 0) + 1;
	const board: BoardJob[] = jobs
		.map((j) => ({ ...j, openOutOfSpec: open[j.id] ?? 0 }))
		.sort((a, b) => (a.bay ?? '~').localeCompare(b.bay ?? '~') || a.number - b.number);
	return { board, queue };
}

// ——— Spec drift ———

export interface DriftPoint {
	at: string;
	value: number;
	jobNumber: number;
	tool: string | null;
	verdict: Verdict | null;
}

/** Library steps with a unit and torque tools, each with how many readings it has. */
export async function driftOptions(shopId: string) {
	const steps = await db.execute(sql`
		select ps.id, ps.label, p.name as procedure_name, ps.unit,
			(select count(*) from job_step js
				join log_entry e on e.job_step_id = js.id
				where js.procedure_step_id = ps.id and js.shop_id = ${shopId}
				  and e.kind = 'measure' and e.spec_value is not null)::int as n
		from procedure_step ps
		join procedure p on p.id = ps.procedure_id
		where ps.shop_id = ${shopId} and ps.unit is not null
		order by n desc, p.name, ps.position`);
	const tools = await db.execute(sql`
		select t.id, t.identifier, t.kind,
			(select count(*) from log_entry e where e.torque_tool_id = t.id and e.shop_id = ${shopId}
				and e.kind = 'measure')::int as n
		from torque_tool t where t.shop_id = ${shopId}
		order by t.identifier`);
	return {
		steps: steps.map((r) => ({
			id: r.id as string,
			label: r.label as string,
			procedureName: r.procedure_name as string,
			unit: r.unit as string,
			n: Number(r.n)
		})),
		tools: tools.map((r) => ({
			id: r.id as string,
			identifier: r.identifier as string,
			kind: r.kind as string,
			n: Number(r.n)
		}))
	};
}

/**
 * Logged values of one library step across jobs (matched through job_step.procedure_step_id),
 * oldest first, in the step's unit, without retracted entries. The band is the step's min/max,
 * or nominal ± the shop's tolerance for a nominal-only spec.
 */
export async function driftForStep(shopId: string, procedureStepId: string) {
	const [step] = await db.execute(sql`
		select ps.id, ps.label, ps.unit, ps.min, ps.max, ps.nominal, p.name as procedure_name,
			sh.default_tolerance_pct
		from procedure_step ps
		join procedure p on p.id = ps.procedure_id
		join shop sh on sh.id = ps.shop_id
		where ps.id = ${procedureStepId} and ps.shop_id = ${shopId}`);
	if (!step) return null;
	const rows = await db.execute(driftStepSql(shopId, procedureStepId, step.unit as string));
	const nominal = step.nominal === null ? null : Number(step.nominal);
	const tol = Number(step.default_tolerance_pct) / 100;
	let lsl = step.min === null ? null : Number(step.min);
	let usl = step.max === null ? null : Number(step.max);
	if (lsl === null && usl === null && nominal !== null) {
		lsl = nominal * (1 - tol);
		usl = nominal * (1 + tol);
	}
	return {
		step: {
			id: step.id as string,
			label: step.label as string,
			procedureName: step.procedure_name as string,
			unit: step.unit as string,
			nominal,
			lsl,
			usl,
			bandFromTolerance: step.min === null && step.max === null && nominal !== null
		},
		points: rows.map((r): DriftPoint => ({
			at: new Date(r.occurred_at as string).toISOString(),
			value: Number(r.spec_value),
			jobNumber: Number(r.job_number),
			tool: (r.tool as string | null) ?? null,
			verdict: (r.verdict as Verdict | null) ?? null
		}))
	};
}

/**
 * Readings made with one torque tool, as deviation from each step's nominal (or the middle of
 * its band), oldest first; and the tool's calibration facts.
 */
export async function driftForTool(shopId: string, toolId: string) {
	const [tool] = await db.execute(sql`
		select t.id, t.identifier, t.kind, t.range_min, t.range_max, t.unit, to_char(t.calibrated_on, 'YYYY-MM-DD') as calibrated_on,
			t.interval_months, sh.calibration_months
		from torque_tool t join shop sh on sh.id = t.shop_id
		where t.id = ${toolId} and t.shop_id = ${shopId}`);
	if (!tool) return null;
	const rows = await db.execute(sql`
		select e.occurred_at, e.spec_value, j.number as job_number, e.verdict, st.label,
			coalesce(st.nominal, (st.min + st.max) / 2) as nominal
		from log_entry e
		join job j on j.id = e.job_id
		join job_step st on st.id = e.job_step_id
		where e.torque_tool_id = ${toolId} and e.shop_id = ${shopId}
		  and e.kind = 'measure' and e.spec_value is not null and e.spec_unit = st.unit
		  and not exists (select 1 from log_entry r where r.retracts = e.id)
		order by e.occurred_at asc`);
	return {
		tool: {
			id: tool.id as string,
			identifier: tool.identifier as string,
			kind: tool.kind as string,
			rangeMin: Number(tool.range_min),
			rangeMax: Number(tool.range_max),
			unit: tool.unit as string,
			calibratedOn: (tool.calibrated_on as string | null) ?? null,
			intervalMonths: Number(tool.interval_months ?? tool.calibration_months)
		},
		readings: rows
			.filter((r) => r.nominal !== null)
			.map((r) => ({
				at: new Date(r.occurred_at as string).toISOString(),
				value: Number(r.spec_value),
				nominal: Number(r.nominal),
				label: r.label as string,
				jobNumber: Number(r.job_number),
				verdict: (r.verdict as Verdict | null) ?? null
			}))
	};
}
