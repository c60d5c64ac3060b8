// Recomputes every job's hash chain from the stored entries (src/lib/evidence/chain.ts) and
// names the first entry where each broken chain fails. Used by `npm run db:verify` and the
// owner's page; takes the postgres.js client so the script can run it without SvelteKit.
import type { Sql } from 'postgres';
import { ChainWalker, type ChainBreak, type ChainFields } from '../evidence/chain';

export interface JobBreak extends ChainBreak {
	shopId: string;
	jobId: string;
	jobNumber: number | null;
	/** What the entry said, when the entry is still there. */
	rawText: string | null;
}

export interface VerifyReport {
	jobs: number;
	entries: number;
	breaks: JobBreak[];
	ms: number;
}

/** The timestamp form the canonical JSON uses (the same words as in drizzle/0010). */
const iso = (col: string) => `to_char(${col} at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"')`;

// Every value as PostgreSQL's text form, as the trigger hashed it.
const ENTRY_COLUMNS = `e.shop_id::text as shop_id, e.author_id::text as author_id, e.id::text as id,
	e.inspection_item_id::text as inspection_item_id, e.job_id::text as job_id,
	e.job_step_id::text as job_step_id, e.kind::text as kind, e.note,
	${iso('e.occurred_at')} as occurred_at, e.part_id::text as part_id,
	e.part_quantity::text as part_quantity, e.chain_pos::text as pos, e.prev_hash as prev,
	e.raw_text, ${iso('e.recorded_at')} as recorded_at, e.responds_to::text as responds_to,
	e.retracts::text as retracts, e.source::text as source, e.spec_unit,
	e.spec_value::text as spec_value, e.tool_calibration_overdue::text as tool_calibration_overdue,
	e.torque_tool_id::text as torque_tool_id, e.unit, e.value::text as value,
	e.verdict::text as verdict, e.entry_hash, e.chain_v::text as v,
	e.adapter_mm::text as adapter_mm, e.fluid, e.fluid_verdict,
	e.tool_length_mm::text as tool_length_mm, e.wrench_setting::text as wrench_setting,
	e.wrench_setting_unit`;

export function chainFields(row: Record<string, unknown>): ChainFields {
	const t = (k: string) => (row[k] === null || row[k] === undefined ? null : String(row[k]));
	return {
		adapter_mm: t('adapter_mm'),
		author_id: t('author_id'),
		fluid: t('fluid'),
		fluid_verdict: t('fluid_verdict'),
		id: t('id'),
		inspection_item_id: t('inspection_item_id'),
		job_id: t('job_id'),
		job_step_id: t('job_step_id'),
		kind: t('kind'),
		note: t('note'),
		occurred_at: t('occurred_at'),
		part_id: t('part_id'),
		part_quantity: t('part_quantity'),
		pos: t('pos'),
		prev: t('prev'),
		raw_text: t('raw_text'),
		recorded_at: t('recorded_at'),
		responds_to: t('responds_to'),
		retracts: t('retracts'),
		shop_id: t('shop_id'),
		source: t('source'),
		spec_unit: t('spec_unit'),
		spec_value: t('spec_value'),
		tool_calibration_overdue: t('tool_calibration_overdue'),
		tool_length_mm: t('tool_length_mm'),
		torque_tool_id: t('torque_tool_id'),
		unit: t('unit'),
		v: t('v'),
		value: t('value'),
		verdict: t('verdict'),
		wrench_setting: t('wrench_setting'),
		wrench_setting_unit: t('wrench_setting_unit')
	};
}

/**
 * Reads entries in the text forms the chain uses, in chain order, a page at a time. One
 * transaction with extra_float_digits = 1, so floats come back in their shortest exact form
 * whatever the session's setting.
 */
export async function eachChainRow(
	client: Sql,
	where: { shopId?: string; jobId?: string },
	onRows: (rows: Record<string, unknown>[]) => void | Promise<void>
): Promise<void> {
	await client.begin(async (tx) => {
		await tx`set local extra_float_digits = 1`;
		const shop = where.shopId ?? null;
		const job = where.jobId ?? null;
		const cursor = tx`
			select ${tx.unsafe(ENTRY_COLUMNS)}
			from log_entry e
			where (${shop}::uuid is null or e.shop_id = ${shop}::uuid)
				and (${job}::uuid is null or e.job_id = ${job}::uuid)
			order by e.job_id, e.chain_pos`.cursor(1000);
		for await (const rows of cursor) await onRows(rows);
	});
}

/** Verifies every chain (of one shop when `shopId` is given). */
export async function verifyChains(client: Sql, shopId?: string): Promise<VerifyReport> {
	const started = performance.now();
	const heads = new Map<
		string,
		{ shopId: string; pos: number; hash: string | null; number: number | null }
	>();
	const headRows = await client`
		select h.shop_id::text as shop_id, h.job_id::text as job_id, h.pos, h.hash, j.number
		from log_chain_head h left join job j on j.id = h.job_id and j.shop_id = h.shop_id
		where ${shopId ?? null}::uuid is null or h.shop_id = ${shopId ?? null}::uuid`;
	for (const h of headRows) {
		heads.set(h.job_id, { shopId: h.shop_id, pos: h.pos, hash: h.hash, number: h.number });
	}
	const breaks: JobBreak[] = [];
	let entries = 0;
	let jobs = 0;
	let current: {
		jobId: string;
		shopId: string;
		walker: ChainWalker;
		texts: Map<string, string>;
	} | null = null;

	const close = () => {
		if (!current) return;
		const head = heads.get(current.jobId) ?? null;
		heads.delete(current.jobId);
		const broken = current.walker.finish(head);
		if (broken) {
			breaks.push({
				...broken,
				shopId: current.shopId,
				jobId: current.jobId,
				jobNumber: head?.number ?? null,
				rawText: broken.entryId ? (current.texts.get(broken.entryId) ?? null) : null
			});
		}
		jobs++;
	};

	await eachChainRow(client, { shopId }, (rows) => {
		for (const row of rows) {
			const jobId = String(row.job_id);
			if (current?.jobId !== jobId) {
				close();
				current = {
					jobId,
					shopId: String(row.shop_id),
					walker: new ChainWalker(),
					texts: new Map()
				};
			}
			const before = current.walker.broken;
			current.walker.step({ fields: chainFields(row), hash: String(row.entry_hash) });
			if (!before && current.walker.broken) current.texts.set(String(row.id), String(row.raw_text));
			entries++;
		}
	});
	close();
	// Heads whose job has no entry left at all.
	for (const [jobId, head] of heads) {
		if (head.pos === 0) continue;
		jobs++;
		breaks.push({
			shopId: head.shopId,
			jobId,
			jobNumber: head.number,
			entryId: null,
			pos: 1,
			reason: 'missing_after',
			message: `The head records ${head.pos} entries; none is left in the log.`,
			rawText: null
		});
	}
	return { jobs, entries, breaks, ms: performance.now() - started };
}
