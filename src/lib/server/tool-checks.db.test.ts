import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from './db';
import { addTorqueTool, entryOf, makeShop } from './db/fixtures';
import * as s from './db/schema';
import type { Actor } from './bench/job';
import { listTools } from './bench/tools';
import { appendEntry } from './log/append';
import { lastChecks, recordCheck, toolWithChecks } from './tool-checks';

type Fixture = Awaited<ReturnType<typeof makeShop>>;
const tech = (f: Fixture): Actor => ({ id: f.tech.id, shopId: f.shop.id, role: 'technician' });
const post = (text: string, torqueToolId: string) => ({
	id: crypto.randomUUID(),
	text,
	source: 'typed' as const,
	torqueToolId
});

const addTool = addTorqueTool;

// ISO 6789-1 Type II class A above 10 N·m: ±4 % (ISO 6789-1:2017, per a tool maker's summary); readings invented.
const good = [
	{ set: 40, readings: [40.8, 39.5, 41.2, 40.1, 40.4] },
	{ set: 120, readings: [121, 118.9, 122.4, 120.3, 119.6] },
	{ set: 200, readings: [207.9, 203, 198.2, 204.4, 201] }
];
const bad = [
	{ set: 40, readings: [40.8, 39.5, 41.2, 40.1, 40.4] },
	{ set: 120, readings: [121, 118.9, 122.4, 120.3, 119.6] },
	{ set: 200, readings: [208.1, 203, 198.2, 204.4, 201] }
];
const check = (checkedOn: string, points: typeof good) => ({
	checkedOn,
	checkedBy: 'Owner',
	tester: 'Bench tester (demo)',
	points,
	permissiblePct: null,
	note: null
});

describe('torque tool checks', () => {
	it('a passed check renews the calibration date; a failed one marks the tool at the Bench', async () => {
		const f = await makeShop('Tools');
		const tool = await addTool(f);
		const passed = await recordCheck(f.shop.id, f.owner.id, tool.id, check('2026-11-02', good));
		expect(passed).toMatchObject({ ok: true, permissiblePct: 4, result: { passed: true } });
		const [after] = await db.select().from(s.torqueTool).where(eq(s.torqueTool.id, tool.id));
		expect(after.calibratedOn).toBe('2026-11-02');

		const failed = await recordCheck(f.shop.id, f.owner.id, tool.id, check('2026-12-03', bad));
		expect(failed).toMatchObject({ ok: true, result: { passed: false } });
		const [still] = await db.select().from(s.torqueTool).where(eq(s.torqueTool.id, tool.id));
		expect(still.calibratedOn).toBe('2026-11-02');

		const [t] = await listTools(f.shop.id, new Date('2026-12-04T09:00:00Z'));
		expect(t).toMatchObject({ state: 'overdue', checkFailed: '2026-12-03' });
		expect((await lastChecks(f.shop.id)).get(tool.id)).toEqual({
			checkedOn: '2026-12-03',
			passed: false
		});
		// an entry made with it now says so
		const e = entryOf(await appendEntry(tech(f), f.job.id, post('rear axle 85 nm', tool.id)));
		expect(e.toolCalibrationOverdue).toBe(true);
	});

	it('finds the jobs tightened with the tool since its last passed check', async () => {
		// the job card is opened before the first entry's fixed clock (back-dating is bounded by it)
		const f = await makeShop('Tools', { jobOpenedAt: new Date('2026-10-30T08:00:00Z') });
		const tool = await addTool(f);
		await recordCheck(f.shop.id, f.owner.id, tool.id, check('2026-11-02', good));
		const before = entryOf(
			await appendEntry(
				tech(f),
				f.job.id,
				{ ...post('rear axle 85 nm at 10:00', tool.id) },
				new Date('2026-11-01T12:00:00Z')
			)
		);
		const inside = entryOf(
			await appendEntry(
				tech(f),
				f.job.id,
				post('rear axle 95 nm', tool.id),
				new Date('2026-11-20T10:00:00Z')
			)
		);
		expect(new Date(before.occurredAt) < new Date('2026-11-02')).toBe(true);
		await recordCheck(f.shop.id, f.owner.id, tool.id, check('2026-12-03', bad));
		const found = await toolWithChecks(f.shop.id, tool.id, new Date('2026-12-04T09:00:00Z'));
		expect(found?.standing.state).toBe('failed');
		expect(found?.checks.map((c) => c.passed)).toEqual([false, true]);
		expect(found?.revisit).toHaveLength(1);
		expect(found?.revisit[0]).toMatchObject({
			jobId: f.job.id,
			entries: 1,
			outOfSpecNow: inside.verdict === 'high' ? 1 : 0
		});
		// another shop sees neither the tool nor its checks
		const other = await makeShop('Other');
		expect(await toolWithChecks(other.shop.id, tool.id)).toBeNull();
		expect(
			await recordCheck(other.shop.id, other.owner.id, tool.id, check('2026-12-03', good))
		).toMatchObject({
			ok: false,
			kind: 'not_found'
		});
	});

	it('a tool of a kind Benchcall cannot read asks for its permissible deviation', async () => {
		const f = await makeShop('Tools');
		const tool = await addTool(f, { kind: 'dial wrench (demo)' });
		const r = await recordCheck(f.shop.id, f.owner.id, tool.id, check('2026-12-01', good));
		expect(r).toMatchObject({ ok: false, kind: 'invalid', field: 'permissiblePct' });
		const given = await recordCheck(f.shop.id, f.owner.id, tool.id, {
			...check('2026-12-01', bad),
			permissiblePct: 6
		});
		expect(given).toMatchObject({ ok: true, permissiblePct: 6, result: { passed: true } });
	});
});

describe('torque through an adapter at the Bench', () => {
	it('records the adapter, the tool’s length and the setting for the torque said', async () => {
		const f = await makeShop('Adapter');
		const tool = await addTool(f);
		const e = entryOf(
			await appendEntry(tech(f), f.job.id, post('rear axle 88 nm adapter 50 mm', tool.id))
		);
		expect(e).toMatchObject({ specValue: 88, verdict: 'in', adapterMm: 50, toolLengthMm: 300 });
		// T × L / (L + E), the formula of the worked examples in US Army TM 1-1500-204-23-9 and the Piper PA-28-161 maintenance manual §2-90
		expect(e.wrenchSetting).toBeCloseTo((88 * 300) / 350, 10);
		expect(e.wrenchSettingUnit).toBe('N.m');
		const back = entryOf(
			await appendEntry(tech(f), f.job.id, post('rear axle 85 nm adapter 50 mm back', tool.id))
		);
		expect(back.adapterMm).toBe(-50);
		expect(back.wrenchSetting).toBeCloseTo((85 * 300) / 250, 10);
		const square = entryOf(
			await appendEntry(tech(f), f.job.id, post('rear axle 85 nm crowfoot at 90', tool.id))
		);
		expect(square).toMatchObject({ adapterMm: 0, wrenchSetting: 85 });
	});

	it('takes an adapter picked on the Bench when the phrase says none; a said one wins', async () => {
		const f = await makeShop('Adapter');
		const tool = await addTool(f);
		const picked = entryOf(
			await appendEntry(tech(f), f.job.id, { ...post('rear axle 88 nm', tool.id), adapterMm: -50 })
		);
		expect(picked).toMatchObject({ adapterMm: -50, toolLengthMm: 300 });
		expect(picked.wrenchSetting).toBeCloseTo((88 * 300) / 250, 10);
		const said = entryOf(
			await appendEntry(tech(f), f.job.id, {
				...post('rear axle 88 nm crowfoot at 90', tool.id),
				adapterMm: -50
			})
		);
		expect(said).toMatchObject({ adapterMm: 0, wrenchSetting: 88 });
		// a step that is not a torque keeps no adapter
		const note = entryOf(
			await appendEntry(tech(f), f.job.id, {
				...post('note adapter left on', tool.id),
				adapterMm: 50
			})
		);
		expect(note.adapterMm).toBeNull();
	});

	it('keeps the adapter without a setting when no tool length is known', async () => {
		const f = await makeShop('Adapter');
		const tool = await addTool(f, { effectiveLengthMm: null });
		const withTool = entryOf(
			await appendEntry(tech(f), f.job.id, post('rear axle 88 nm adapter 50 mm', tool.id))
		);
		expect(withTool).toMatchObject({ adapterMm: 50, toolLengthMm: null, wrenchSetting: null });
		const noTool = entryOf(
			await appendEntry(tech(f), f.job.id, {
				id: crypto.randomUUID(),
				text: 'rear axle 88 nm adapter 50 mm',
				source: 'typed'
			})
		);
		expect(noTool).toMatchObject({ adapterMm: 50, torqueToolId: null, wrenchSetting: null });
	});
});
