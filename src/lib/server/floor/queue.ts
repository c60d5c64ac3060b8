// The Floor's out-of-spec queue and the foreman's answers to it: accept with a reason, or order
// a redo. The log stays append-only: an answer is a new entry naming the one it answers.
import { sql } from 'drizzle-orm';
import type { OpenRedo, Verdict } from '$lib/floor/log';
import { isUuid } from '$lib/ids';
import { failure, type Result } from '$lib/result';
import { db } from '../db';
import { openOutOfSpecCountSql, openOutOfSpecSql } from '../floor-sql';
import { isLive } from '../log/live';
import { writeEntries } from '../log/write';
import type { Actor } from './log';

export type { OpenRedo };

/** drizzle/0013 refused the entry: the job's record closed before it was written. */
export const closedRecordMessage = 'This job’s record is closed: it takes no more entries.';

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

/** Redo orders on a job whose step has no new entry since: what the Bench shows on top. */
export async function listOpenRedos(shopId: string, jobId: string): Promise<OpenRedo[]> {
	const rows = await db.execute(sql`
		select d.id, d.job_step_id, st.label as step_label, d.note, u.name as foreman_name,
			d.occurred_at, prev.raw_text as previous
		from log_entry d
		join job_step st on st.id = d.job_step_id and st.shop_id = d.shop_id
		join "user" u on u.id = d.author_id
		left join log_entry prev on prev.id = d.responds_to and prev.shop_id = d.shop_id
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

/** The queue item of an entry still waiting for an answer. */
async function openItem(shopId: string, entryId: string): Promise<Result<{ item: QueueItem }>> {
	if (!isUuid(entryId)) return failure('not_found', 'No such entry in this shop.');
	const [entry] = await db.execute(
		sql`select id, job_id from log_entry where id = ${entryId} and shop_id = ${shopId}`
	);
	if (!entry) return failure('not_found', 'No such entry in this shop.');
	const items = await listOutOfSpec(shopId, entry.job_id as string);
	const item = items.find((i) => i.entryId === entryId);
	if (!item) {
		return failure(
			'conflict',
			'This entry is no longer waiting: it was answered already or a newer value was logged.'
		);
	}
	return { ok: true, item };
}

/** The foreman's answer to a waiting entry: an `accept` or `redo` entry naming it. */
async function answer(
	actor: Actor,
	entryId: string,
	kind: 'accept' | 'redo',
	note: string
): Promise<Result<{ id: string }>> {
	const open = await openItem(actor.shopId, entryId);
	if (!open.ok) return open;
	const { item } = open;
	const id = crypto.randomUUID();
	const written = await writeEntries((insert) =>
		insert({
			id,
			shopId: actor.shopId,
			jobId: item.jobId,
			jobStepId: item.jobStepId,
			authorId: actor.id,
			kind,
			rawText: `${kind === 'accept' ? 'accepted' : 'redo'}: ${item.stepLabel}`,
			source: 'typed',
			note,
			respondsTo: item.entryId,
			occurredAt: new Date()
		})
	);
	if (written.closed) return failure('conflict', closedRecordMessage);
	return { ok: true, id };
}

/** Accepts an out-of-spec value with the foreman's reason (an `accept` entry answering it). */
export function acceptEntry(actor: Actor, entryId: string, reason: string) {
	return answer(actor, entryId, 'accept', reason);
}

/**
 * Orders a redo of an out-of-spec step: a `redo` entry with the foreman's note. The step counts
 * as not done again until the technician logs a new entry for it.
 */
export function orderRedo(actor: Actor, entryId: string, note: string) {
	return answer(actor, entryId, 'redo', note);
}
