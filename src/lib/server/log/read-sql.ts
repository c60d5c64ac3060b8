// SQL of the Bench's job log, kept free of SvelteKit imports so that scripts/bench-floor.ts
// measures exactly what the app runs.
import { sql } from 'drizzle-orm';

export const entrySelect = sql`
	select e.id, e.seq, e.job_id, e.job_step_id, st.label as step_label, e.author_id,
		a.name as author_name, e.kind, e.raw_text, e.source, e.value, e.unit, e.spec_value, e.spec_unit,
		st.min as spec_min, st.max as spec_max, st.nominal as spec_nominal,
		e.verdict, e.fluid, e.fluid_verdict, e.note, e.torque_tool_id, tt.identifier as torque_tool, e.tool_calibration_overdue,
		e.adapter_mm, e.tool_length_mm, e.wrench_setting, e.wrench_setting_unit,
		e.retracts, e.occurred_at, e.recorded_at,
		rb.id as retracted_by_id, rba.name as retracted_by_name, rb.recorded_at as retracted_at,
		coalesce((select json_agg(json_build_object('id', at.id, 'fileName', at.file_name) order by at.created_at)
			from attachment at where at.entry_id = e.id and at.shop_id = e.shop_id), '[]'::json) as photos
	from log_entry e
	join "user" a on a.id = e.author_id
	left join job_step st on st.id = e.job_step_id and st.shop_id = e.shop_id
	left join torque_tool tt on tt.id = e.torque_tool_id and tt.shop_id = e.shop_id
	left join lateral (
		select r.id, r.author_id, r.recorded_at from log_entry r
		where r.retracts = e.id and r.shop_id = e.shop_id order by r.seq limit 1
	) rb on true
	left join "user" rba on rba.id = rb.author_id
`;

/**
 * A page of one job's log, newest first: entries older than `before` (a seq), or newer than
 * `after`; `limit` rows at most.
 */
export function jobLogPageSql(
	shopId: string,
	jobId: string,
	opts: { before?: number; after?: number; limit: number }
) {
	const before = opts.before !== undefined ? sql`and e.seq < ${opts.before}` : sql``;
	const after = opts.after !== undefined ? sql`and e.seq > ${opts.after}` : sql``;
	return sql`${entrySelect}
		where e.shop_id = ${shopId} and e.job_id = ${jobId} ${before} ${after}
		order by e.seq desc limit ${opts.limit}`;
}
