// SQL of the Floor's two hot queries (the running log's pages and a step's drift points), kept
// free of SvelteKit imports so that scripts/bench-floor.ts measures exactly what the app runs.
import { sql, type SQL } from 'drizzle-orm';
import type { LogFilter } from '../floor/log';

export const entryColumns = sql`
	e.id, e.seq, e.job_id, j.number as job_number, j.bay, e.author_id, u.name as author_name,
	e.kind, e.raw_text, e.value, e.unit, e.spec_value, e.spec_unit, e.verdict, e.note,
	st.label as step_label, e.retracts, e.responds_to, e.occurred_at`;
export const entryJoins = sql`
	join job j on j.id = e.job_id
	join "user" u on u.id = e.author_id
	left join job_step st on st.id = e.job_step_id`;

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

/** Logged values of one library step across jobs, oldest first, in the step's unit. */
export function driftStepSql(shopId: string, procedureStepId: string, unit: string) {
	return sql`
		select e.occurred_at, e.spec_value, j.number as job_number, t.identifier as tool, e.verdict
		from job_step js
		join log_entry e on e.job_step_id = js.id
		join job j on j.id = e.job_id
		left join torque_tool t on t.id = e.torque_tool_id
		where js.procedure_step_id = ${procedureStepId} and js.shop_id = ${shopId}
		  and e.kind = 'measure' and e.spec_value is not null and e.spec_unit = ${unit}
		  and not exists (select 1 from log_entry r where r.retracts = e.id)
		order by e.occurred_at asc`;
}
