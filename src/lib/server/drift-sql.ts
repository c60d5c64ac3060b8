// SQL of spec drift (one library step across jobs, one torque tool), kept free of SvelteKit
// imports so that scripts/bench-floor.ts measures exactly what the app runs. Every query reads
// one time window; statistics are computed here, in the database, and the chart gets at most
// about MAX_POINTS points (see driftPointsSql).
import { sql, type SQL } from 'drizzle-orm';
import { isLive } from './log/live';

export interface Window {
	from: Date;
	to: Date;
}

/** Readings of one library step (matched through job_step.procedure_step_id) in a window. */
export function stepReadingsSql(shopId: string, procedureStepId: string, unit: string, w: Window) {
	// Only jobs with a live entry since the window opened can hold a reading in it
	// (job_log_state.last_entry_at), so old jobs cost nothing.
	return sql`
		select e.id, e.occurred_at, e.spec_value as value, e.verdict, j.number as job_number,
			st.label, t.identifier as tool, coalesce(st.nominal, (st.min + st.max) / 2) as nominal
		from job_log_state jl
		join job_step st on st.job_id = jl.job_id and st.shop_id = jl.shop_id
			and st.procedure_step_id = ${procedureStepId}
		join log_entry e on e.job_step_id = st.id and e.kind = 'measure' and e.spec_value is not null
			and e.spec_unit = ${unit}
			and e.occurred_at >= ${w.from.toISOString()} and e.occurred_at < ${w.to.toISOString()}
		join job j on j.id = st.job_id and j.shop_id = st.shop_id
		left join torque_tool t on t.id = e.torque_tool_id and t.shop_id = e.shop_id
		where jl.shop_id = ${shopId} and jl.last_entry_at >= ${w.from.toISOString()}
		  and ${isLive('e')}`;
}

/** Readings made with one torque tool in a window, each with its step's nominal. */
export function toolReadingsSql(shopId: string, toolId: string, w: Window) {
	return sql`
		select e.id, e.occurred_at, e.spec_value as value, e.verdict, j.number as job_number,
			st.label, null::text as tool, coalesce(st.nominal, (st.min + st.max) / 2) as nominal
		from log_entry e
		join job j on j.id = e.job_id and j.shop_id = e.shop_id
		join job_step st on st.id = e.job_step_id and st.shop_id = e.shop_id
		where e.torque_tool_id = ${toolId} and e.shop_id = ${shopId}
		  and e.kind = 'measure' and e.spec_value is not null and e.spec_unit = st.unit
		  and e.occurred_at >= ${w.from.toISOString()} and e.occurred_at < ${w.to.toISOString()}
		  and ${isLive('e')}`;
}

/** Where the newest `n` readings of a tool begin (null when it has fewer). */
export function toolNthNewestSql(shopId: string, toolId: string, n: number) {
	return sql`
		select e.occurred_at from log_entry e
		where e.torque_tool_id = ${toolId} and e.shop_id = ${shopId} and e.kind = 'measure'
		  and e.torque_tool_id is not null
		order by e.occurred_at desc offset ${n - 1} limit 1`;
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
	if (!opts.downsample) {
		return sql`with r as (${readings}) select * from r order by occurred_at, id`;
	}
	return sql`
		with r as (${readings}),
		b as (select r.*, ntile(${opts.buckets}) over (order by occurred_at, id) as bucket from r),
		p as (
			select b.*,
				row_number() over (partition by bucket order by value, occurred_at, id) as lo,
				row_number() over (partition by bucket order by value desc, occurred_at, id) as hi
			from b
		)
		select id, occurred_at, value, verdict, job_number, label, tool, nominal from p
		where lo = 1 or hi = 1
			${opts.keepOut ? sql`or verdict in ('low', 'high')` : sql``}
		order by occurred_at, id`;
}

/**
 * How many readings each library step of the shop has in a window (the step picker), from the
 * jobs active in it.
 */
export function stepCountsSql(shopId: string, w: Window) {
	return sql`
		select st.procedure_step_id as id, count(*)::int as n
		from job_log_state jl
		join job_step st on st.job_id = jl.job_id and st.shop_id = jl.shop_id
		join log_entry e on e.job_step_id = st.id and e.kind = 'measure' and e.spec_value is not null
			and e.spec_unit = st.unit
			and e.occurred_at >= ${w.from.toISOString()} and e.occurred_at < ${w.to.toISOString()}
		where jl.shop_id = ${shopId} and jl.last_entry_at >= ${w.from.toISOString()}
		  and st.procedure_step_id is not null
		group by st.procedure_step_id`;
}
