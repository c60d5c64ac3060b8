// The Floor's running log: pages of the shop's log, the live stream's reads and the filters.
// Every query is scoped by the caller's shop id.
import { sql } from 'drizzle-orm';
import type { FloorEntry, LogFilter, Verdict } from '$lib/floor/log';
import { RESCAN_WINDOW } from '$lib/floor/resume';
import { db } from '../db';
import { entryColumns, entryJoins, logPageSql } from '../floor-sql';

/** Who acts on the Floor (a foreman or the owner). */
export interface Actor {
	id: string;
	shopId: string;
	name: string;
}

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
