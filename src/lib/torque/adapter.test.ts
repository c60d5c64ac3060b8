import { describe, expect, it } from 'vitest';
import {
	adapterFromMm,
	adapterInUse,
	adapterLine,
	adapterPreview,
	adapterWords,
	inToolUnit,
	signedLength,
	stepAdapter,
	wrenchSetting
} from './adapter';

// Length units cancel in L / (L + E), so the published examples in inches and feet check the
// formula as they stand; Benchcall itself keeps lengths in mm.
const setting = (t: number, l: number, e: number) =>
	wrenchSetting(t, l, { lengthMm: Math.abs(e), direction: e < 0 ? 'back' : 'out' }).setting;

describe('wrench setting with an adapter (T × L / (L + E))', () => {
	it('US Army TM 1-1500-204-23-9: 300 in·lb, L 10 in, E 4 in → 214 in·lb', () => {
		// US Army TM 1-1500-204-23-9's worked example; the manual rounds 214.2857 to 214
		expect(setting(300, 10, 4)).toBeCloseTo(214.2857, 4);
	});

	it('US Navy aviation training manual: 100 in·lb, L 12 in, E 6 in → 66.7 in·lb', () => {
		// the US Navy aviation training manual's worked example
		expect(setting(100, 12, 6)).toBeCloseTo(66.7, 1);
	});

	it('Piper PA-28-161 maintenance manual §2-90: 30 ft·lb, L 1 ft, E 0.25 ft → 24 ft·lb', () => {
		// Piper PA-28-161 maintenance manual §2-90, worked example
		expect(setting(30, 1, 0.25)).toBeCloseTo(24, 10);
	});

	it('Robinson R66 maintenance manual ch. 20: 135 in·lb, L 10, E 1.5 → 117.39; back → 158.82', () => {
		// Robinson R66 maintenance manual ch. 20, worked example: lengthening and shortening (L − E)
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
		// NIST SP 811 App. B.8: 1 lbf·ft = 1.355818 N·m (exact 1.3558179483314004 from the 1959 definitions)
		const nm = setting(54.23272, 300, 50) as number; // 40 lbf·ft at the fastener
		expect(inToolUnit(nm, 'N.m', '[lbf_av].[ft_i]')).toBeCloseTo((40 * 300) / 350, 4);
		expect(inToolUnit(10, 'N.m', 'N.m')).toBe(10);
		expect(inToolUnit(10, 'N.m', 'mm')).toBeNull();
	});
});

describe('the adapter on screen', () => {
	const step = { unit: 'N.m', nominal: null, min: 80, max: 90 };
	const tool = { effectiveLengthMm: 300, unit: 'N.m' };

	it('the setting for the torque said, else for the middle of the spec', () => {
		const said = adapterPreview(
			{ lengthMm: 50, direction: 'out' },
			{ value: 88, unit: 'N.m' },
			step,
			tool
		);
		expect(said).toMatchObject({ words: 'adapter 50 mm', target: 88, from: 'said', problem: null });
		expect(said.setting).toBeCloseTo((88 * 300) / 350, 10);
		const spec = adapterPreview({ lengthMm: 50, direction: 'back' }, null, step, tool);
		expect(spec).toMatchObject({ target: 85, from: 'spec', words: 'adapter 50 mm pointing back' });
		expect(spec.setting).toBeCloseTo((85 * 300) / 250, 10);
	});

	it('in the wrench’s unit when it differs', () => {
		// 2.6 kgf·m = 25.49729 N·m (common practice, exact via g_n = 9.80665 m/s²)
		const r = adapterPreview(
			{ lengthMm: 0, direction: 'square' },
			{ value: 25.49729, unit: 'N.m' },
			{ unit: 'N.m', nominal: 25.5, min: null, max: null },
			{ effectiveLengthMm: null, unit: 'kgf.m' }
		);
		expect(r.setting).toBe(25.49729);
		expect(r.inTool?.unit).toBe('kgf.m');
		expect(r.inTool?.value).toBeCloseTo(2.6, 5);
	});

	it('asks for what is missing', () => {
		const noTorque = adapterPreview(
			{ lengthMm: 50, direction: 'out' },
			null,
			{ unit: 'N.m', nominal: null, min: 80, max: null },
			tool
		);
		expect(noTorque.problem).toMatch(/Say the torque/);
		expect(adapterPreview({ lengthMm: 50, direction: 'out' }, null, step, null).problem).toMatch(
			/Pick the torque tool/
		);
	});

	it('the job log’s line for a stored entry', () => {
		expect(adapterLine(50, 75.428571, 'N.m')).toBe('adapter 50 mm · set 75.4 N·m');
		expect(adapterLine(-50, 102, 'N.m')).toBe('adapter 50 mm pointing back · set 102 N·m');
		expect(adapterLine(0, 22, 'N.m')).toBe('crowfoot at 90° · no correction');
		expect(adapterLine(50, null, null)).toMatch(/not worked out/);
		expect(adapterFromMm(-12)).toEqual({ lengthMm: 12, direction: 'back' });
	});
});

describe("a step's own adapter (a crowfoot the procedure calls for)", () => {
	// lengths in mm as Benchcall stores them: 1 in = 25.4 mm exactly (NIST SP 811 App. B.8)
	const IN = 25.4;

	it('US Army TM 1-1500-204-23-9 on a step: 300 in·lb, wrench 10 in, crowfoot 4 in → 214', () => {
		// US Army TM 1-1500-204-23-9's worked example, with the adapter on the step, not said
		const step = stepAdapter(4 * IN, 'out');
		expect(step).toEqual({ lengthMm: 101.6, direction: 'out' });
		const inUse = adapterInUse(null, null, step);
		expect(inUse?.from).toBe('step');
		const p = adapterPreview(
			inUse!.adapter,
			null,
			{ unit: '[lbf_av].[in_i]', nominal: 300, min: null, max: null },
			{ effectiveLengthMm: 10 * IN, unit: '[lbf_av].[in_i]' }
		);
		expect(p.from).toBe('spec');
		expect(p.setting).toBeCloseTo(214.2857, 4);
		expect(signedLength(inUse!.adapter)).toBeCloseTo(101.6, 10);
	});

	it('Robinson R66 ch. 20 on a step pointing back: 135 in·lb, L 10, E 1.5 → 158.82', () => {
		// Robinson R66 maintenance manual ch. 20, worked example (shortening: L − E)
		const step = stepAdapter(1.5 * IN, 'back');
		const p = adapterPreview(
			step!,
			{ value: 135, unit: '[lbf_av].[in_i]' },
			{ unit: '[lbf_av].[in_i]', nominal: null, min: 130, max: 140 },
			{ effectiveLengthMm: 10 * IN, unit: '[lbf_av].[in_i]' }
		);
		expect(p.from).toBe('said');
		expect(p.setting).toBeCloseTo(158.82, 2);
		expect(signedLength(step!)).toBeCloseTo(-38.1, 10);
	});

	it('a said adapter overrides a picked one, and both override the step’s', () => {
		const said = { lengthMm: 50, direction: 'out' as const };
		const picked = { lengthMm: 30, direction: 'back' as const };
		const step = { lengthMm: 45, direction: 'square' as const };
		expect(adapterInUse(said, picked, step)).toEqual({ adapter: said, from: 'said' });
		expect(adapterInUse(null, picked, step)).toEqual({ adapter: picked, from: 'picked' });
		expect(adapterInUse(undefined, null, step)).toEqual({ adapter: step, from: 'step' });
		expect(adapterInUse(null, null, null)).toBeNull();
	});

	it('a step without both fields, or with a length out of range, has no adapter', () => {
		expect(stepAdapter(null, null)).toBeNull();
		expect(stepAdapter(45, null)).toBeNull();
		expect(stepAdapter(null, 'square')).toBeNull();
		expect(stepAdapter(45, 'sideways')).toBeNull();
		expect(stepAdapter(-1, 'out')).toBeNull();
		expect(stepAdapter(1001, 'out')).toBeNull();
		expect(stepAdapter(Number.NaN, 'out')).toBeNull();
		// a crowfoot at 90° keeps its length, though it needs no correction (common practice)
		expect(stepAdapter(45, 'square')).toEqual({ lengthMm: 45, direction: 'square' });
		expect(adapterWords({ lengthMm: 45, direction: 'square' })).toBe('crowfoot 45 mm at 90°');
		expect(adapterWords(adapterFromMm(0))).toBe('crowfoot at 90°');
		expect(adapterWords({ lengthMm: 38.5, direction: 'back' })).toBe(
			'adapter 38.5 mm pointing back'
		);
	});
});
