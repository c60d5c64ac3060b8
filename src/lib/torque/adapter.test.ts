import { describe, expect, it } from 'vitest';
import { inToolUnit, signedLength, wrenchSetting } from './adapter';

// Length units cancel in L / (L + E), so the published examples in inches and feet check the
// formula as they stand; Benchcall itself keeps lengths in mm.
const setting = (t: number, l: number, e: number) =>
	wrenchSetting(t, l, { lengthMm: Math.abs(e), direction: e < 0 ? 'back' : 'out' }).setting;

describe('wrench setting with an adapter (T × L / (L + E))', () => {
	it('US Army TM 1-1500-204-23-9: 300 in·lb, L 10 in, E 4 in → 214 in·lb', () => {
		// TRADE.md §5 [SRC]; the manual rounds 214.2857 to 214
		expect(setting(300, 10, 4)).toBeCloseTo(214.2857, 4);
	});

	it('US Navy aviation training manual: 100 in·lb, L 12 in, E 6 in → 66.7 in·lb', () => {
		// TRADE.md §5 [SRC]
		expect(setting(100, 12, 6)).toBeCloseTo(66.7, 1);
	});

	it('Piper PA-28-161 maintenance manual §2-90: 30 ft·lb, L 1 ft, E 0.25 ft → 24 ft·lb', () => {
		// TRADE.md §5 [SRC]
		expect(setting(30, 1, 0.25)).toBeCloseTo(24, 10);
	});

	it('Robinson R66 maintenance manual ch. 20: 135 in·lb, L 10, E 1.5 → 117.39; back → 158.82', () => {
		// TRADE.md §5 [SRC]: lengthening and shortening (L − E)
		expect(setting(135, 10, 1.5)).toBeCloseTo(117.39, 2);
		expect(setting(135, 10, -1.5)).toBeCloseTo(158.82, 2);
	});

	it('a crowfoot at 90° to the wrench needs no correction, whatever its length', () => {
		// common practice: at 90° the adapter adds no length along the lever (E = 0)
		const r = wrenchSetting(52.95591, 300, { lengthMm: 45, direction: 'square' });
		expect(r).toEqual({ setting: 52.95591, problem: null });
		expect(signedLength({ lengthMm: 45, direction: 'square' })).toBe(0);
	});

	it('says what is missing instead of guessing', () => {
		const noTool = wrenchSetting(88, null, { lengthMm: 50, direction: 'out' });
		expect(noTool.setting).toBeNull();
		expect(noTool.problem).toMatch(/torque tool/);
		expect(wrenchSetting(88, 0, { lengthMm: 50, direction: 'out' }).problem).toMatch(/above zero/);
		expect(wrenchSetting(0, 300, { lengthMm: 50, direction: 'out' }).problem).toMatch(/above zero/);
		expect(wrenchSetting(88, 300, { lengthMm: -5, direction: 'out' }).setting).toBeNull();
		const tooLong = wrenchSetting(88, 300, { lengthMm: 300, direction: 'back' });
		expect(tooLong.setting).toBeNull();
		expect(tooLong.problem).toMatch(/shorter/);
		expect(wrenchSetting(Number.NaN, 300, { lengthMm: 50, direction: 'out' }).setting).toBeNull();
	});

	it('gives the setting in the wrench’s own unit too', () => {
		// NIST SP 811 App. B.8: 1 lbf·ft = 1.355818 N·m (TRADE.md §3, exact 1.3558179483314004)
		const nm = setting(54.23272, 300, 50) as number; // 40 lbf·ft at the fastener
		expect(inToolUnit(nm, 'N.m', '[lbf_av].[ft_i]')).toBeCloseTo((40 * 300) / 350, 4);
		expect(inToolUnit(10, 'N.m', 'N.m')).toBe(10);
		expect(inToolUnit(10, 'N.m', 'mm')).toBeNull();
	});
});
