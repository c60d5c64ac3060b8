import { describe, expect, it } from 'vitest';
import { parsePhrase, type StepSpec } from './index';
import { extractAdapter } from './adapter';
import { tokenize, normalizeText } from './text';

// Invented demo steps.
const STEPS: StepSpec[] = [
	{ id: 'axle', label: 'Rear axle nut', unit: 'N.m', min: 80, max: 90 },
	{ id: 'head', label: 'Head nuts', unit: 'N.m', nominal: 22 },
	{ id: 'ext', label: 'Fork extension cap', unit: 'N.m', nominal: 23 }
];
const p = (text: string) => parsePhrase(text, { steps: STEPS, timeZone: 'UTC' });
const x = (text: string) => extractAdapter(tokenize(normalizeText(text)));

describe('an adapter said in the phrase', () => {
	it('"rear axle 88 Nm adapter 50 mm": the torque and the step read as before', () => {
		const r = p('rear axle 88 Nm adapter 50 mm');
		expect(r.stepId).toBe('axle');
		expect(r.quantity).toEqual({ value: 88, unit: 'N.m' });
		expect(r.verdict).toBe('in');
		expect(r.adapter).toEqual({ lengthMm: 50, direction: 'out' });
	});

	it('before or after, written or spoken, in mm, cm or inches', () => {
		expect(p('with a 50 mm adapter rear axle 85 Nm').adapter).toEqual({
			lengthMm: 50,
			direction: 'out'
		});
		expect(p('rear axle eighty five newton metres fifty millimetre extension').adapter).toEqual({
			lengthMm: 50,
			direction: 'out'
		});
		expect(p('head nuts 22 Nm crowfoot 4.5 cm').adapter?.lengthMm).toBeCloseTo(45, 10);
		// 1959 international inch: 2 in = 50.8 mm (NIST SP 811 App. B.8)
		expect(p('head nuts 22 Nm adapter 2 in').adapter?.lengthMm).toBeCloseTo(50.8, 10);
		expect(p('head nuts 22 Nm adapter 50mm').stepId).toBe('head');
	});

	it('pointing back, and a crowfoot at 90°', () => {
		expect(p('rear axle 85 Nm adapter 50 mm back').adapter).toEqual({
			lengthMm: 50,
			direction: 'back'
		});
		const sq = p('head nuts 22 Nm crowfoot at 90');
		expect(sq.adapter).toEqual({ lengthMm: 0, direction: 'square' });
		expect(sq.stepId).toBe('head');
		expect(sq.quantity).toEqual({ value: 22, unit: 'N.m' });
		expect(p('head nuts 22 Nm crow foot 45 mm at 90 degrees').adapter).toEqual({
			lengthMm: 45,
			direction: 'square'
		});
	});

	it('a step whose name holds the word is not an adapter', () => {
		const r = p('fork extension cap 23 Nm');
		expect(r.stepId).toBe('ext');
		expect(r.adapter).toBeNull();
		expect(r.problems).toEqual([]);
	});

	it('a length with no unit, or one out of reach, is a problem, not a guess', () => {
		const r = p('rear axle 85 Nm adapter back');
		expect(r.adapter).toBeNull();
		expect(r.problems.join(' ')).toMatch(/length with its unit/);
		const far = p('rear axle 85 Nm adapter 5000 mm');
		expect(far.adapter).toBeNull();
		expect(far.problems.join(' ')).toMatch(/5000 mm/);
		expect(x('adapter').adapter).toBeNull();
		expect(x('').rest).toEqual([]);
	});
});
