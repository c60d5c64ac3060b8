// Spec drift: one library step's readings across jobs, or one torque tool's, in a time window.
// Statistics come from SQL aggregates and the chart gets at most about MAX_POINTS points
// (drift-sql.ts), so a view costs what its window holds, not the years of history.
import { sql, type SQL } from 'drizzle-orm';
import type { Verdict } from '$lib/floor/log';
import {
	DEFAULT_DAYS,
	MAX_DAYS,
	MAX_POINTS,
	MIN_READINGS,
	POINT_BUCKETS,
	type DriftWindow
} from '$lib/floor/drift-window';
import { db } from './db';
import {
	driftPointsSql,
	driftStatsSql,
	stepCountsSql,
	stepReadingsSql,
	toolNthNewestSql,
	toolReadingsSql,
	type Window
} from './drift-sql';

const DAY = 86_400_000;

export interface DriftPoint {
	at: string;
	value: number;
	nominal: number | null;
	jobNumber: number;
	label: string;
	tool: string | null;
	verdict: Verdict | null;
}

export interface DriftStats {
	n: number;
	mean: number | null;
	s: number | null;
	min: number | null;
	max: number | null;
	nOut: number;
	/** Readings with a nominal above zero, and how many sit above and below it. */
	nNominal: number;
	above: number;
	below: number;
	meanDeviationPct: number | null;
}

export interface DriftView {
	window: { from: string; to: string; days: number; widened: boolean };
	stats: DriftStats;
	points: DriftPoint[];
	/** All readings drawn, or each run's extremes (and whether every out-of-spec one is). */
	drawn: { all: boolean; everyOutOfSpec: boolean };
}

const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));

async function view(readings: (w: Window) => SQL, w: Window, widened: boolean): Promise<DriftView> {
	const [r] = await db.execute(driftStatsSql(readings(w)));
	const stats: DriftStats = {
		n: Number(r.n),
		mean: num(r.mean),
		s: num(r.s),
		min: num(r.min),
		max: num(r.max),
		nOut: Number(r.n_out),
		nNominal: Number(r.n_nominal),
		above: Number(r.above),
		below: Number(r.below),
		meanDeviationPct: num(r.mean_dev_pct)
	};
	const downsample = stats.n > MAX_POINTS;
	// Every out-of-spec reading is drawn as long as they leave room for the runs' extremes.
	const keepOut = stats.nOut <= MAX_POINTS - 2 * POINT_BUCKETS;
	const rows = await db.execute(
		driftPointsSql(readings(w), { downsample, buckets: POINT_BUCKETS, keepOut })
	);
	return {
		window: {
			from: w.from.toISOString(),
			to: w.to.toISOString(),
			days: Math.round((w.to.getTime() - w.from.getTime()) / DAY),
			widened
		},
		stats,
		points: rows.map((p) => ({
			at: new Date(p.occurred_at as string).toISOString(),
			value: Number(p.value),
			nominal: num(p.nominal),
			jobNumber: Number(p.job_number),
			label: p.label as string,
			tool: (p.tool as string | null) ?? null,
			verdict: (p.verdict as Verdict | null) ?? null
		})),
		drawn: { all: !downsample, everyOutOfSpec: !downsample || keepOut }
	};
}

/** Library steps with a unit (with their readings in the last DEFAULT_DAYS) and torque tools. */
export async function driftOptions(shopId: string, now = new Date()) {
	const recent = { from: new Date(now.getTime() - DEFAULT_DAYS * DAY), to: now };
	const [steps, counts, tools] = await Promise.all([
		db.execute(sql`
			select ps.id, ps.label, p.name as procedure_name, ps.unit
			from procedure_step ps join procedure p on p.id = ps.procedure_id and p.shop_id = ps.shop_id
			where ps.shop_id = ${shopId} and ps.unit is not null
			order by p.name, ps.position`),
		db.execute(stepCountsSql(shopId, recent)),
		db.execute(sql`
			select t.id, t.identifier, t.kind from torque_tool t where t.shop_id = ${shopId}
			order by t.identifier`)
	]);
	const n = new Map(counts.map((c) => [c.id as string, Number(c.n)]));
	return {
		steps: steps
			.map((r) => ({
				id: r.id as string,
				label: r.label as string,
				procedureName: r.procedure_name as string,
				unit: r.unit as string,
				n: n.get(r.id as string) ?? 0
			}))
			.sort((a, b) => b.n - a.n),
		tools: tools.map((r) => ({
			id: r.id as string,
			identifier: r.identifier as string,
			kind: r.kind as string
		}))
	};
}

/**
 * Readings of one library step across jobs in the window, in the step's unit, without retracted
 * entries. The default window reaches back in steps (a year, then two) while it holds fewer than
 * MIN_READINGS readings. The band is the step's min/max, or nominal ± the shop's tolerance.
 */
export async function driftForStep(
	shopId: string,
	procedureStepId: string,
	window: DriftWindow & { ok: true }
) {
	const [step] = await db.execute(sql`
		select ps.id, ps.label, ps.unit, ps.min, ps.max, ps.nominal, p.name as procedure_name,
			sh.default_tolerance_pct
		from procedure_step ps
		join procedure p on p.id = ps.procedure_id and p.shop_id = ps.shop_id
		join shop sh on sh.id = ps.shop_id
		where ps.id = ${procedureStepId} and ps.shop_id = ${shopId} and ps.unit is not null`);
	if (!step) return null;
	const readings = (w: Window) => stepReadingsSql(shopId, procedureStepId, step.unit as string, w);
	let d = await view(readings, window, false);
	if (!window.custom) {
		for (const days of [365, MAX_DAYS]) {
			if (d.stats.n >= MIN_READINGS) break;
			d = await view(
				readings,
				{ from: new Date(window.to.getTime() - days * DAY), to: window.to },
				true
			);
		}
	}
	const nominal = num(step.nominal);
	const tol = Number(step.default_tolerance_pct) / 100;
	let lsl = num(step.min);
	let usl = num(step.max);
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
		...d
	};
}

/**
 * Readings made with one torque tool in the window (the default one reaches back to the tool's
 * MIN_READINGS newest readings, at most MAX_DAYS), each against its step's nominal (or the middle
 * of its band); and the tool's calibration facts.
 */
export async function driftForTool(
	shopId: string,
	toolId: string,
	window: DriftWindow & { ok: true }
) {
	const [tool] = await db.execute(sql`
		select t.id, t.identifier, t.kind, t.range_min, t.range_max, t.unit,
			to_char(t.calibrated_on, 'YYYY-MM-DD') as calibrated_on, t.interval_months, sh.calibration_months
		from torque_tool t join shop sh on sh.id = t.shop_id
		where t.id = ${toolId} and t.shop_id = ${shopId}`);
	if (!tool) return null;
	let w: Window = window;
	let widened = false;
	if (!window.custom) {
		const [nth] = await db.execute(toolNthNewestSql(shopId, toolId, MIN_READINGS));
		const earliest = window.to.getTime() - MAX_DAYS * DAY;
		const start = nth ? new Date(nth.occurred_at as string).getTime() : earliest;
		if (start < window.from.getTime()) {
			w = { from: new Date(Math.max(start, earliest)), to: window.to };
			widened = true;
		}
	}
	const d = await view((x) => toolReadingsSql(shopId, toolId, x), w, widened);
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
		...d
	};
}
