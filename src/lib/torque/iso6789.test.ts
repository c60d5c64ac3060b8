import { describe, expect, it } from 'vitest';
import { deviationPct, judgeCheck, permissiblePct, testPoints, toolClass } from './iso6789';

describe('ISO 6789 permissible deviation', () => {
	it('Type II class A: ±4 % above 10 N·m, ±6 % at or below', () => {
		// ISO 6789-1:2017 per a tool maker's summary
		expect(permissiblePct('Type II class A click', 200, 'N.m')).toBe(4);
		expect(permissiblePct('Type II class A click', 10, 'N.m')).toBe(6);
		expect(permissiblePct('type 2 class a', 25, 'N.m')).toBe(4);
	});

	it('reads the maximum in the tool’s own unit before the 10 N·m line', () => {
		// NIST SP 811 App. B.8: 1 lbf·in = 0.1129848 N·m, so 80 lbf·in = 9.04 N·m (≤ 10)
		expect(permissiblePct('Type II class A', 80, '[lbf_av].[in_i]')).toBe(6);
		// 100 lbf·in = 11.30 N·m (> 10)
		expect(permissiblePct('Type II class A', 100, '[lbf_av].[in_i]')).toBe(4);
	});

	it('other Type II classes [MEM], and unknown kinds left to the owner', () => {
		// ISO 6789-1:2017 [MEM]: classes B, C, E, F ±6 %; D and G as A
		expect(permissiblePct('Type II class B', 200, 'N.m')).toBe(6);
		expect(permissiblePct('Type II class D', 200, 'N.m')).toBe(4);
		expect(permissiblePct('Type I class A dial', 200, 'N.m')).toBeNull();
		expect(permissiblePct('click wrench', 200, 'N.m')).toBeNull();
		expect(permissiblePct(null, 200, 'N.m')).toBeNull();
		expect(toolClass('Type II class A click')).toEqual({ type: 'II', cls: 'A' });
		expect(toolClass('Type I class C')).toEqual({ type: 'I', cls: 'C' });
	});
});

describe('ISO 6789-2 test points and the judgement', () => {
	it('20 %, 60 % and 100 % of the maximum', () => {
		// ISO 6789-2:2017 [MEM]
		expect(testPoints(40, 200)).toEqual([40, 120, 200]);
		expect(testPoints(20, 100)).toEqual([20, 60, 100]);
		// a range starting above 20 % is tested at its lower limit
		expect(testPoints(60, 200)).toEqual([60, 120, 200]);
	});

	it('a click wrench 40–200 N·m within ±4 % passes; one reading 4.05 % high fails', () => {
		// ISO 6789-1 Type II class A limit (per a tool maker's summary of the standard); readings invented for the test
		const good = judgeCheck(
			[
				{ set: 40, readings: [40.8, 39.5, 41.2, 40.1, 40.4] },
				{ set: 120, readings: [121, 118.9, 122.4, 120.3, 119.6] },
				{ set: 200, readings: [207.9, 203, 198.2, 204.4, 201] }
			],
			4
		);
		expect(good.passed).toBe(true);
		expect(good.worstPct).toBeCloseTo(3.95, 10);
		expect(good.short).toEqual([]);
		const bad = judgeCheck(
			[
				{ set: 40, readings: [40.8, 39.5, 41.2, 40.1, 40.4] },
				{ set: 200, readings: [208.1, 203, 198.2, 204.4, 201] }
			],
			4
		);
		expect(bad.passed).toBe(false);
		expect(bad.worstPct).toBeCloseTo(4.05, 10);
	});

	it('a reading right on the limit passes; below the set value counts by size', () => {
		expect(judgeCheck([{ set: 50, readings: [52] }], 4).passed).toBe(true);
		const low = judgeCheck([{ set: 50, readings: [47.9] }], 4);
		expect(low.passed).toBe(false);
		expect(low.worstPct).toBeCloseTo(-4.2, 10);
		expect(deviationPct(100, 96)).toBeCloseTo(-4, 12);
	});

	it('notes points with fewer than five readings', () => {
		const r = judgeCheck([{ set: 40, readings: [40.2, 40.1] }], 4);
		expect(r.passed).toBe(true);
		expect(r.short).toEqual([40]);
	});

	it('bad input is a problem, never a pass', () => {
		expect(judgeCheck([], 4).passed).toBe(false);
		expect(judgeCheck([{ set: 0, readings: [1] }], 4).problems[0]).toMatch(/above zero/);
		expect(judgeCheck([{ set: 40, readings: [] }], 4).passed).toBe(false);
		expect(judgeCheck([{ set: 40, readings: [Number.NaN] }], 4).passed).toBe(false);
		expect(judgeCheck([{ set: 40, readings: [40] }], 0).problems[0]).toMatch(/permissible/);
	});
});
