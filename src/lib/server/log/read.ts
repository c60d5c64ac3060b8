// Reading the job log: one entry, a page of a job's log, and a repeated id.
import { failure, type Result } from '$lib/result';
import { and, eq, sql } from 'drizzle-orm';
import type { FluidVerdict, Verdict } from '$lib/phrase';
import type { EntryView } from '$lib/bench/types';
import { db } from '../db';
import * as s from '../db/schema';
import { entrySelect, jobLogPageSql } from './read-sql';

function iso(v: unknown): string {
	return (v instanceof Date ? v : new Date(String(v))).toISOString();
}

export function toEntry(r: Record<string, unknown>): EntryView {
	return {
		id: r.id as string,
		seq: Number(r.seq),
		jobId: r.job_id as string,
		stepId: r.job_step_id as string | null,
		stepLabel: r.step_label as string | null,
		authorId: r.author_id as string,
		authorName: r.author_name as string,
		kind: r.kind as EntryView['kind'],
		rawText: r.raw_text as string,
		source: r.source as EntryView['source'],
		value: r.value as number | null,
		unit: r.unit as string | null,
		specValue: r.spec_value as number | null,
		specUnit: r.spec_unit as string | null,
		specMin: r.spec_min as number | null,
		specMax: r.spec_max as number | null,
		specNominal: r.spec_nominal as number | null,
		verdict: r.verdict as Verdict | null,
		fluid: (r.fluid as string | null) ?? null,
		fluidVerdict: (r.fluid_verdict as FluidVerdict | null) ?? null,
		note: r.note as string | null,
		torqueToolId: r.torque_tool_id as string | null,
		torqueTool: r.torque_tool as string | null,
		toolCalibrationOverdue: Boolean(r.tool_calibration_overdue),
		adapterMm: (r.adapter_mm as number | null) ?? null,
		toolLengthMm: (r.tool_length_mm as number | null) ?? null,
		wrenchSetting: (r.wrench_setting as number | null) ?? null,
		wrenchSettingUnit: (r.wrench_setting_unit as string | null) ?? null,
		retracts: r.retracts as string | null,
		retractedBy: r.retracted_by_id
			? {
					id: r.retracted_by_id as string,
					authorName: r.retracted_by_name as string,
					at: iso(r.retracted_at)
				}
			: null,
		occurredAt: iso(r.occurred_at),
		recordedAt: iso(r.recorded_at),
		photos: (r.photos as { id: string; fileName: string }[] | null) ?? []
	};
}

export async function readEntry(shopId: string, id: string): Promise<EntryView | null> {
	const rows = await db.execute(sql`${entrySelect} where e.shop_id = ${shopId} and e.id = ${id}`);
	return rows[0] ? toEntry(rows[0]) : null;
}

/**
 * A page of the job log, newest first. `before`: entries older than that seq (the next page);
 * `after`: entries newer than that seq (live catch-up).
 */
export async function listEntries(
	shopId: string,
	jobId: string,
	opts: { before?: number; after?: number; limit?: number } = {}
): Promise<{ entries: EntryView[]; nextBefore: number | null }> {
	const limit = Math.min(Math.max(Math.trunc(opts.limit ?? 50), 1), 200);
	const rows = await db.execute(
		jobLogPageSql(shopId, jobId, { before: opts.before, after: opts.after, limit: limit + 1 })
	);
	const entries = rows.slice(0, limit).map(toEntry);
	const more = rows.length > limit;
	return { entries, nextBefore: more ? entries[entries.length - 1].seq : null };
}

/** The answer to an id already stored: the entry, or a conflict when the id is another job's. */
export type Existing = Result<{ created: false; entry: EntryView }>;

const idTaken = failure('conflict', 'That entry id is already used.');

/** A repeat of an id: the stored entry when it is this job's, a 409 when the id is taken. */
export async function existingEntry(
	shopId: string,
	jobId: string,
	id: string
): Promise<Existing | null> {
	const [row] = await db
		.select({ shopId: s.logEntry.shopId, jobId: s.logEntry.jobId })
		.from(s.logEntry)
		.where(and(eq(s.logEntry.shopId, shopId), eq(s.logEntry.id, id)))
		.limit(1);
	if (!row) return null;
	if (row.shopId !== shopId || row.jobId !== jobId) return idTaken;
	const entry = await readEntry(shopId, id);
	return entry ? { ok: true, created: false, entry } : idTaken;
}
