// SQL of the Floor's two hot queries (the running log's pages and a step's drift points), kept
// free of SvelteKit imports so that scripts/bench-floor.ts measures exactly what the app runs.
import { sql, type SQL } from 'drizzle-orm';
import type { LogFilter } from '../floor/log';
import type { JobState } from '../jobs/states';
import { stateArray } from './state-array';

export const entryColumns = sql`
	e.id, e.seq, e.job_id, j.number as job_number, j.bay, e.author_id, u.name as author_name,
	e.kind, e.raw_text, e.value, e.unit, e.spec_value, e.spec_unit, e.verdict, e.note,
	st.label as step_label, e.retracts, e.responds_to, e.occurred_at`;
export const entryJoins = sql`
	join job j on j.id = e.job_id and j.shop_id = e.shop_id
	join "user" u on u.id = e.author_id
	left join job_step st on st.id = e.job_step_id and st.shop_id = e.shop_id`;

function likePattern(q: string): string {
	return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

export function filterSql(f: LogFilter): SQL {
	const parts: SQL[] = [];
	if (f.bay) parts.push(sql`and j.bay = ${f.bay}`);
	if (f.technician) parts.push(sql`and e.author_id = ${f.technician}`);
	if (f.job !== undefined) parts.push(sql`and j.number = ${f.job}`);
	if (f.verdict === 'out') parts.push(sql`and e.verdict in ('low', 'high')`);
	else if (f.verdict) parts.push(sql`and e.verdict = ${f.verdict}`);
	if (f.q) {
		const p = likePattern(f.q);
		parts.push(sql`and (e.raw_text ilike ${p} or st.label ilike ${p})`);
	}
	return sql.join(parts, sql` `);
}

/** A page of the running log, newest first, older than `before`; `limit` rows at most. */
export function logPageSql(
	shopId: string,
	filter: LogFilter,
	before: number | undefined,
	limit: number
) {
	return sql`
		select ${entryColumns}
		from log_entry e ${entryJoins}
		where e.shop_id = ${shopId}
		  ${before ? sql`and e.seq < ${before}` : sql``}
		  ${filterSql(filter)}
		order by e.seq desc
		limit ${limit}
	`;
}

/** Job states whose out-of-spec entries still need an answer. */
export const openStates: JobState[] = [
	'open',
	'in_work',
	'final_inspection',
	'on_hold',
	'ready_to_invoice'
];

/**
 * Steps whose latest measurement (not retracted) is under or over, or whose fluid grade fails the
 * step's spec, and has no answer yet (an
 * accept or a redo responding to it), on jobs still open. A new in-spec measurement of the step
 * leaves the queue empty for it; a new out-of-spec one is a new item. Read from job_step_state
 * (kept at each append, drizzle/0011) starting from the shop's open jobs, so the cost follows
 * the open work. Oldest first; `after` is the seq of the last item already shown.
 */
export function openOutOfSpecSql(
	shopId: string,
	opts: { jobId?: string; after?: number; limit?: number } = {}
) {
	return sql`
		select e.id, e.seq, e.job_id, j.number as job_number, j.bay, e.job_step_id,
			st.label as step_label, u.name as author_name, e.raw_text, e.spec_value, e.spec_unit,
			e.verdict, e.fluid, e.fluid_verdict, st.min, st.max, st.nominal, e.occurred_at
		from job j
		join job_step_state ss on ss.job_id = j.id and ss.shop_id = j.shop_id and ss.waiting
		join log_entry e on e.id = ss.latest_measure_id and e.shop_id = ss.shop_id
		join job_step st on st.id = ss.job_step_id and st.shop_id = ss.shop_id
		join "user" u on u.id = e.author_id
		where j.shop_id = ${shopId}
		  and j.state = any(${stateArray(openStates)}::job_state[])
		  ${opts.jobId ? sql`and j.id = ${opts.jobId}` : sql``}
		  ${opts.after !== undefined ? sql`and ss.latest_measure_seq > ${opts.after}` : sql``}
		order by ss.latest_measure_seq asc
		${opts.limit !== undefined ? sql`limit ${opts.limit}` : sql``}`;
}

/** How many items the whole queue holds (its pages together). */
export function openOutOfSpecCountSql(shopId: string) {
	return sql`
		select count(*)::int as n
		from job j
		join job_step_state ss on ss.job_id = j.id and ss.shop_id = j.shop_id and ss.waiting
		where j.shop_id = ${shopId}
		  and j.state = any(${stateArray(openStates)}::job_state[])`;
}
