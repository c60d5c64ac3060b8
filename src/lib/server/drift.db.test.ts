// Spec drift read in SQL over a window: the statistics equal simple-statistics over every
// reading in the window (checked against the npm library simple-statistics 7), and the chart's points stay near MAX_POINTS while
// keeping every out-of-spec reading and the window's extremes.
import { sql } from 'drizzle-orm';
import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { driftWindow, MAX_POINTS, POINT_BUCKETS } from '$lib/floor/drift-window';
import { db } from './db';
import { makeShop } from './db/fixtures';
import * as s from './db/schema';
import { driftForStep, driftForTool } from './drift';

const DAY = 86_400_000;
const now = new Date('2026-12-04T06:00:00Z');

async function shopWithReadings(n: number) {
	const f = await makeShop('Drift');
	const [ps] = await db
		.insert(s.procedureStep)
		.values({
			shopId: f.shop.id,
			procedureId: (
				await db
					.select()
					.from(s.procedure)
					.where(sql`shop_id = ${f.shop.id}`)
			)[0].id,
			position: 1,
			label: 'Rear axle nut',
			unit: 'N.m',
			min: 80,
			max: 96
		})
		.returning();
	await db.execute(sql`update job_step set procedure_step_id = ${ps.id} where id = ${f.step.id}`);
	const [tool] = await db
		.insert(s.torqueTool)
		.values({
			shopId: f.shop.id,
			identifier: 'TW-A',
			kind: 'click',
			rangeMin: 20,
			rangeMax: 120,
			unit: 'N.m'
		})
		.returning();
	// One reading an hour going back from now (demo values): mostly in spec, every 97th over,
	// every 89th under, and one spike far above.
	const values: { at: Date; value: number }[] = [];
	for (let i = 0; i < n; i++) {
		const value = i === 321 ? 140 : i % 97 === 0 ? 99 : i % 89 === 0 ? 77 : 86 + ((i * 7) % 9);
		values.push({ at: new Date(now.getTime() - (i + 1) * 3_600_000), value });
	}
	const rows = values.map((v) => ({
		id: crypto.randomUUID(),
		shopId: f.shop.id,
		jobId: f.job.id,
		jobStepId: f.step.id,
		authorId: f.tech.id,
		kind: 'measure' as const,
		rawText: `rear axle ${v.value} nm`,
		source: 'typed' as const,
		value: v.value,
		unit: 'N.m',
		specValue: v.value,
		specUnit: 'N.m',
		verdict: (v.value < 80 ? 'low' : v.value > 96 ? 'high' : 'in') as 'low' | 'high' | 'in',
		torqueToolId: tool.id,
		occurredAt: v.at
	}));
	for (let i = 0; i < rows.length; i += 1000)
		await db.insert(s.logEntry).values(rows.slice(i, i + 1000));
	return { f, ps, tool, values, rows };
}

describe('spec drift over a window', () => {
	it('computes the statistics of every reading and draws about 1,000 points, every out-of-spec one among them', async () => {
		const { f, ps, tool, values, rows } = await shopWithReadings(1500);
		// A retracted reading is left out of everything.
		await db.insert(s.logEntry).values({
			id: crypto.randomUUID(),
			shopId: f.shop.id,
			jobId: f.job.id,
			jobStepId: f.step.id,
			authorId: f.tech.id,
			kind: 'retraction',
			rawText: 'undo',
			source: 'typed',
			retracts: rows[5].id,
			occurredAt: now
		});
		const w = driftWindow({}, now);
		if (!w.ok) throw new Error(w.message);
		const inWindow = values.filter((v, i) => i !== 5 && v.at >= w.from);
		expect(inWindow.length).toBe(1499);

		const d = (await driftForStep(f.shop.id, ps.id, w))!;
		const xs = inWindow.map((v) => v.value);
		expect(d.stats.n).toBe(xs.length);
		expect(d.stats.mean).toBeCloseTo(ss.mean(xs), 9);
		expect(d.stats.s).toBeCloseTo(ss.sampleStandardDeviation(xs), 9);
		expect([d.stats.min, d.stats.max]).toEqual([ss.min(xs), ss.max(xs)]);
		const out = inWindow.filter((v) => v.value < 80 || v.value > 96);
		expect(d.stats.nOut).toBe(out.length);

		expect(d.drawn).toEqual({ all: false, everyOutOfSpec: true });
		expect(d.points.length).toBeLessThanOrEqual(2 * POINT_BUCKETS + out.length);
		expect(d.points.length).toBeLessThanOrEqual(MAX_POINTS);
		const drawn = new Set(d.points.map((p) => p.at));
		for (const o of out) expect(drawn.has(o.at.toISOString())).toBe(true);
		expect(d.points.some((p) => p.value === 140)).toBe(true);
		// oldest first, all inside the window
		expect(d.points.map((p) => p.at)).toEqual([...d.points.map((p) => p.at)].sort());
		expect(d.points.every((p) => new Date(p.at) >= w.from)).toBe(true);

		// The same readings through the torque tool; deviations in percent of the band's middle.
		const t = (await driftForTool(f.shop.id, tool.id, w))!;
		expect(t.stats.n).toBe(xs.length);
		expect(t.stats.meanDeviationPct).toBeCloseTo(ss.mean(xs.map((x) => ((x - 88) / 88) * 100)), 9);
		expect(t.stats.above).toBe(xs.filter((x) => x > 88).length);
		expect(t.stats.below).toBe(xs.filter((x) => x < 88).length);
	}, 60_000);

	it('reaches back past 90 days to hold 200 readings, keeps a chosen window as it is, and finds nothing in an empty one', async () => {
		const { f, ps, tool } = await shopWithReadings(300);
		// 300 hourly readings span 12.5 days: make them older by moving the window's end back.
		const later = new Date(now.getTime() + 200 * DAY);
		const w = driftWindow({}, later);
		if (!w.ok) throw new Error(w.message);
		const d = (await driftForStep(f.shop.id, ps.id, w))!;
		expect(d.window.widened).toBe(true);
		expect(d.stats.n).toBe(300);
		const t = (await driftForTool(f.shop.id, tool.id, w))!;
		expect(t.window.widened).toBe(true);
		expect(t.stats.n).toBeGreaterThanOrEqual(200);

		const chosen = driftWindow({ from: '2026-12-01', to: '2026-12-02' }, now);
		if (!chosen.ok) throw new Error(chosen.message);
		const c = (await driftForStep(f.shop.id, ps.id, chosen))!;
		expect(c.window.widened).toBe(false);
		expect(c.stats.n).toBe(48);
		expect(c.drawn.all).toBe(true);

		const empty = driftWindow({ from: '2020-01-01', to: '2020-01-31' }, now);
		if (!empty.ok) throw new Error(empty.message);
		const e = (await driftForStep(f.shop.id, ps.id, empty))!;
		expect(e.stats).toMatchObject({ n: 0, mean: null, s: null });
		expect(e.points).toEqual([]);

		// Another shop's step is not found.
		const other = await makeShop('Drift other');
		expect(await driftForStep(other.shop.id, ps.id, chosen)).toBeNull();
		expect(await driftForTool(other.shop.id, tool.id, chosen)).toBeNull();
	}, 60_000);

	it('takes the shop’s days around midnight, not UTC’s', async () => {
		// One reading an hour from 2026-12-02 07:00Z to 2026-12-04 05:00Z. New York is UTC−5 in
		// December (tzdata): its 3 Dec runs from 05:00Z on the 3rd to 05:00Z on the 4th.
		const { f, ps, tool } = await shopWithReadings(47);
		const w = driftWindow({ from: '2026-12-03', to: '2026-12-03' }, now, 'America/New_York');
		if (!w.ok) throw new Error(w.message);
		const ny = (await driftForStep(f.shop.id, ps.id, w))!;
		const at = ny.points.map((p) => p.at).sort();
		expect(at).toHaveLength(24);
		// 00:00 on the 3rd in New York is in; 23:00 on the 2nd and 00:00 on the 4th are not.
		expect(at[0]).toBe('2026-12-03T05:00:00.000Z');
		expect(at[23]).toBe('2026-12-04T04:00:00.000Z');
		const byTool = (await driftForTool(f.shop.id, tool.id, w))!;
		expect(byTool.stats.n).toBe(24);
		// The same day in UTC is a different 24 hours.
		const utc = driftWindow({ from: '2026-12-03', to: '2026-12-03' }, now, 'UTC');
		if (!utc.ok) throw new Error(utc.message);
		const u = (await driftForStep(f.shop.id, ps.id, utc))!;
		expect(u.points.map((p) => p.at).sort()[0]).toBe('2026-12-03T00:00:00.000Z');
	});
});
