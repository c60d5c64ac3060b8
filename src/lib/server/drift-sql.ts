// SQL of spec drift (one library step across jobs, one torque tool), kept free of SvelteKit
// imports so that scripts/bench-floor.ts measures exactly what the app runs. Every query reads
// one time window of drift_reading (drizzle/0017: live measurements, kept at append);
// statistics are computed here, in the database, and the chart gets at most about MAX_POINTS
// points (see driftPointsSql).
import { sql, type SQL } from 'drizzle-orm';

export interface Window {
	from: Date;
	to: Date;
}

/**
 * Readings of one library step (matched through its job steps' procedure_step_id) in a window,
 * from drift_reading (drizzle/0017): live measurements only, one index range.
 */
export function stepReadingsSql(shopId: string, procedureStepId: string, unit: string, w: Window) {
	return sql`
		select r.entry_id as id, r.occurred_at, r.value, r.verdict, r.job_number, r.label,
			r.torque_tool_id, r.shop_id, r.nominal
		from drift_reading r
		where r.shop_id = ${shopId} and r.procedure_step_id = ${procedureStepId} and r.unit = ${unit}
		  and r.occurred_at >= ${w.from.toISOString()} and r.occurred_at < ${w.to.toISOString()}`;
}

/** Readings made with one torque tool in a window, each with its step's nominal. */
export function toolReadingsSql(shopId: string, toolId: string, w: Window) {
	return sql`
		select r.entry_id as id, r.occurred_at, r.value, r.verdict, r.job_number, r.label,
			null::uuid as torque_tool_id, r.shop_id, r.nominal
		from drift_reading r
		where r.shop_id = ${shopId} and r.torque_tool_id = ${toolId} and r.unit = r.step_unit
		  and r.occurred_at >= ${w.from.toISOString()} and r.occurred_at < ${w.to.toISOString()}`;
}

/** Where the newest `n` readings of a tool begin (null when it has fewer). */
export function toolNthNewestSql(shopId: string, toolId: string, n: number) {
	return sql`
		select r.occurred_at from drift_reading r
		where r.shop_id = ${shopId} and r.torque_tool_id = ${toolId} and r.unit = r.step_unit
		order by r.occurred_at desc offset ${n - 1} limit 1`;
}

/**
 * n, mean, sample standard deviation, extremes, out-of-spec counts, and readings above and
 * below their nominal with the mean deviation in percent of nominal (for the sign test).
 */
export function driftStatsSql(readings: SQL) {
	return sql`
		with r as (${readings})
		select count(*)::int as n, avg(value) as mean, stddev_samp(value) as s,
			min(value) as min, max(value) as max,
			count(*) filter (where verdict in ('low', 'high'))::int as n_out,
			count(*) filter (where nominal > 0)::int as n_nominal,
			count(*) filter (where nominal > 0 and value > nominal)::int as above,
			count(*) filter (where nominal > 0 and value < nominal)::int as below,
			avg((value - nominal) / nominal * 100) filter (where nominal > 0) as mean_dev_pct,
			min(occurred_at) as first_at, max(occurred_at) as last_at
		from r`;
}

/**
 * The points to draw, oldest first. Up to `all` readings: every one. Beyond: the window is cut
 * into `buckets` runs of consecutive readings and each run's lowest and highest are drawn, so a
 * spike is never averaged away; out-of-spec readings are all drawn when `keepOut`.
 */
export function driftPointsSql(
	readings: SQL,
	opts: { downsample: boolean; buckets: number; keepOut: boolean }
) {
	// The tool's name is looked up for the drawn points only.
	const named = (points: SQL) => sql`
		select p.id, p.occurred_at, p.value, p.verdict, p.job_number, p.label, t.identifier as tool,
			p.nominal
		from (${points}) p
		left join torque_tool t on t.id = p.torque_tool_id and t.shop_id = p.shop_id
		order by p.occurred_at, p.id`;
	if (!opts.downsample) return named(sql`with r as (${readings}) select * from r`);
	return named(sql`
		with r as (${readings}),
		b as (select r.*, ntile(${opts.buckets}) over (order by occurred_at, id) as bucket from r),
		p as (
			select b.*,
				row_number() over (partition by bucket order by value, occurred_at, id) as lo,
				row_number() over (partition by bucket order by value desc, occurred_at, id) as hi
			from b
		)
		select * from p
		where lo = 1 or hi = 1
			${opts.keepOut ? sql`or verdict in ('low', 'high')` : sql``}`);
}

/**
 * How many readings each library step of the shop has in a window (the step picker), from the
 * jobs active in it (job_log_state.last_entry_at), step by step.
 */
export function stepCountsSql(shopId: string, w: Window) {
	return sql`
		select r.procedure_step_id as id, count(*)::int as n
		from job_log_state jl
		join job_step st on st.job_id = jl.job_id and st.shop_id = jl.shop_id
		join drift_reading r on r.shop_id = st.shop_id and r.job_step_id = st.id
			and r.unit = r.step_unit
			and r.occurred_at >= ${w.from.toISOString()} and r.occurred_at < ${w.to.toISOString()}
		where jl.shop_id = ${shopId} and jl.last_entry_at >= ${w.from.toISOString()}
		  and r.procedure_step_id is not null
		group by r.procedure_step_id`;
}
