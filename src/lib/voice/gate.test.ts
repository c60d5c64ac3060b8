import { describe, expect, it } from 'vitest';
import { parsePhrase, type StepSpec } from '../phrase/index';
import { gatePhrase, isWrongScale, MIN_CONFIDENCE, MIN_OUT_OF_SPEC_CONFIDENCE } from './gate';

// Demo steps (invented demo values, not a maker's specs).
const steps: StepSpec[] = [
	{ id: 'axle', label: 'Rear axle nut', unit: 'N.m', nominal: 88, min: 80, max: 96 },
	{ id: 'chain', label: 'Drive chain slack', unit: 'mm', min: 25, max: 35 },
	{ id: 'oil', label: 'Engine oil fill', unit: 'L', nominal: 1.1, min: 1.0, max: 1.2 },
	{ id: 'plug', label: 'Spark plug', unit: 'kgf.m', nominal: 1.3, min: 1.2, max: 1.4 },
	{ id: 'mount', label: 'Upper engine mount bolt', unit: 'kgf.m', nominal: 5.4 },
	{ id: 'ride', label: 'Test ride' }
];

function gate(heard: string, confidence = 0.95) {
	const parsed = parsePhrase(heard, { steps });
	const step = steps.find((s) => s.id === parsed.stepId) ?? null;
	return gatePhrase({ heard, parsed, step, confidence });
}

describe('the plausibility gate: values against the step’s band (80–96 N·m)', () => {
	it('passes a value in the band', () => {
		expect(gate('rear axle nut eighty eight newton metres')).toEqual({ ok: true });
	});
	it('passes 3× the band’s top (out of spec, but a finding, not a mishearing)', () => {
		expect(gate('rear axle nut two hundred and eighty eight newton metres')).toEqual({
			ok: true
		});
	});
	it('passes a third of the band’s bottom, just', () => {
		// 80 / 3 = 26.67: 27 is inside the plausible range
		expect(gate('rear axle nut twenty seven newton metres').ok).toBe(true);
	});
	it('refuses 10× the band', () => {
		const r = gate('rear axle nut nine hundred and sixty newton metres');
		expect(r).toMatchObject({ ok: false, reason: 'implausible_value' });
	});
	it('refuses 0.3× the band’s bottom', () => {
		// 0.3 × 80 = 24 < 80 / 3
		const r = gate('rear axle nut twenty four newton metres');
		expect(r).toMatchObject({ ok: false, reason: 'implausible_value' });
	});
	it('refuses 0.3× on a millimetre step too (0.3 × 25 = 7.5 → 7 mm)', () => {
		expect(gate('drive chain slack seven millimetres')).toMatchObject({
			reason: 'implausible_value'
		});
		expect(gate('drive chain slack ninety millimetres').ok).toBe(true); // 90 ≤ 3 × 35
		expect(gate('drive chain slack three hundred and fifty millimetres')).toMatchObject({
			reason: 'implausible_value'
		});
	});
	it('judges a step with only a nominal value by the shop tolerance band', () => {
		// 5.4 kgf·m = 52.95591 N·m (common practice; exact via g_n = 9.80665 m/s², NIST SP 811)
		expect(gate('upper engine mount bolt fifty three newton metres').ok).toBe(true);
		expect(gate('upper engine mount bolt five hundred newton metres')).toMatchObject({
			reason: 'implausible_value'
		});
	});
	it('takes a unit of another scale-free family at its converted value', () => {
		// 1.2 kgf·m = 11.76798 N·m (common practice; exact via g_n): in the plug's band
		expect(gate('spark plug eleven point eight newton metres').ok).toBe(true);
	});
});

describe('the plausibility gate: units of the wrong scale', () => {
	it('refuses centimetres on a millimetre step even when the value converts into the band', () => {
		// 3 cm = 30 mm is in spec, but "centimetres" for a chain step is far likelier a mishearing
		const r = gate('drive chain slack three centimetres');
		expect(r).toMatchObject({ ok: false, reason: 'wrong_scale' });
	});
	it('refuses newton centimetres on a newton metre step', () => {
		expect(gate('rear axle nut eighty eight newton centimetres')).toMatchObject({
			reason: 'wrong_scale'
		});
	});
	it('refuses a unit of another kind of quantity', () => {
		expect(gate('rear axle nut twelve litres')).toMatchObject({ reason: 'wrong_scale' });
	});
	it('accepts millilitres on a litre step: oil is called out both ways', () => {
		expect(gate('engine oil fill eleven hundred millilitres').ok).toBe(true);
		expect(isWrongScale('mL', 'L')).toBe(false);
		// but a litre figure said as millilitres is still 1000× out
		expect(gate('engine oil fill one point one millilitres')).toMatchObject({
			reason: 'implausible_value'
		});
	});
	it('knows the families', () => {
		expect(isWrongScale('cm', 'mm')).toBe(true);
		expect(isWrongScale('N.cm', 'N.m')).toBe(true);
		expect(isWrongScale('kgf.m', 'N.m')).toBe(false); // another unit, same scale of value
		expect(isWrongScale('mm', 'mm')).toBe(false);
	});
});

describe('the confidence gate', () => {
	it('refuses a sure-looking phrase heard with low confidence and says what it heard', () => {
		const r = gate('rear axle nut eighty eight newton metres', MIN_CONFIDENCE - 0.01);
		expect(r).toEqual({
			ok: false,
			reason: 'low_confidence',
			heard: 'rear axle nut eighty eight newton metres',
			message:
				'Say it again — heard “rear axle nut eighty eight newton metres”. Not sure I heard that right.'
		});
	});
	it('lets a caller set its own floor (Web Speech confidences are on another scale)', () => {
		const parsed = parsePhrase('next', { steps });
		expect(
			gatePhrase({ heard: 'next', parsed, step: null, confidence: 0.5, minConfidence: 0.4 })
		).toEqual({ ok: true });
	});
	it('checks only confidence for next, spec, history and cancel', () => {
		expect(gate('next').ok).toBe(true);
		expect(gate('spec drive chain slack').ok).toBe(true);
		expect(gate('history rear axle nut').ok).toBe(true);
		expect(gate('cancel').ok).toBe(true);
		expect(gate('next', 0.2)).toMatchObject({ reason: 'low_confidence' });
	});
	it('passes done, notes and parts with enough confidence', () => {
		expect(gate('done test ride').ok).toBe(true);
		expect(gate('note chain worn on the rear').ok).toBe(true);
	});
	it('treats a missing or broken confidence as none', () => {
		const parsed = parsePhrase('next', { steps });
		expect(gatePhrase({ heard: 'next', parsed, step: null, confidence: NaN })).toMatchObject({
			reason: 'low_confidence'
		});
		expect(
			gatePhrase({ heard: 'next', parsed, step: null, confidence: undefined as never })
		).toMatchObject({ reason: 'low_confidence' });
	});
});

describe('out of spec needs a surer ear, or a hand', () => {
	// the rear axle nut's demo band is 80–96 N·m
	it('marks an out-of-spec value heard at 0.85 unsure, and not the same value heard at 0.9', () => {
		expect(gate('rear axle nut seventy newton metres', 0.85)).toEqual({ ok: true, unsure: true });
		expect(gate('rear axle nut seventy newton metres', MIN_OUT_OF_SPEC_CONFIDENCE)).toEqual({
			ok: true
		});
	});
	it('takes an in-spec value at the ordinary floor', () => {
		expect(gate('rear axle nut eighty eight newton metres', 0.8)).toEqual({ ok: true });
	});
	it('lets Web Speech pass its own floor for both', () => {
		const heard = 'rear axle nut seventy newton metres';
		const parsed = parsePhrase(heard, { steps });
		const args = { heard, parsed, step: steps[0], confidence: 0.7 };
		expect(gatePhrase({ ...args, minConfidence: 0.5, minOutOfSpecConfidence: 0.5 })).toEqual({
			ok: true
		});
	});
});

describe('phrases that are not calls', () => {
	it('refuses shop talk as not understood', () => {
		expect(gate('the customer wants it back by friday')).toMatchObject({
			ok: false,
			reason: 'not_understood'
		});
	});
	it('refuses nothing heard', () => {
		expect(gate('', 0)).toMatchObject({ reason: 'not_understood', heard: '' });
	});
	it('refuses a value with no step', () => {
		expect(gate('eighty eight newton metres')).toMatchObject({ ok: false });
	});
	it('never throws on junk input', () => {
		expect(gatePhrase(null as never)).toMatchObject({ ok: false, reason: 'not_understood' });
		expect(
			gatePhrase({ heard: 5, parsed: null, step: null, confidence: 1 } as never)
		).toMatchObject({ ok: false });
	});
});
