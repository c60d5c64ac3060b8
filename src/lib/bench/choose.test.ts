import { describe, expect, it } from 'vitest';
import { parsePhrase, type StepSpec } from '../phrase/index';
import { withStep } from './choose';

const steps: StepSpec[] = [
	{ id: 'front', label: 'Front axle nut', unit: 'N.m', min: 55, max: 65 },
	{ id: 'rear', label: 'Rear axle nut', unit: 'N.m', min: 80, max: 96 },
	{ id: 'upper', label: 'Upper engine mount bolt', unit: 'kgf.m', nominal: 5 }
];

describe('withStep', () => {
	it('judges the same value against the picked step', () => {
		const parsed = parsePhrase('rear axle nut 60 nm', { steps });
		expect(parsed.stepId).toBe('rear');
		expect(parsed.verdict).toBe('low');
		const picked = withStep(parsed, steps[0]);
		expect(picked).toMatchObject({ stepId: 'front', verdict: 'in' });
		expect(picked.specValue).toEqual({ value: 60, unit: 'N.m' });
	});

	it("takes the picked step's unit when none was said", () => {
		const parsed = parsePhrase('rear axle nut 5.2', { steps });
		expect(parsed.unitAssumed).toBe(true);
		const picked = withStep(parsed, steps[2]);
		// 5.2 kgf·m against nominal 5 ± 10 % (shop tolerance, common practice)
		expect(picked).toMatchObject({ stepId: 'upper', verdict: 'in' });
		expect(picked.quantity).toEqual({ value: 5.2, unit: 'kgf.m' });
	});

	it('converts a said unit into the picked step’s unit', () => {
		const parsed = parsePhrase('rear axle nut 50 nm', { steps });
		const picked = withStep(parsed, steps[2]);
		// 50 N·m / 9.80665 = 5.0986 kgf·m (NIST SP 811 B.8)
		expect(picked.specValue?.unit).toBe('kgf.m');
		expect(picked.specValue?.value).toBeCloseTo(5.0986, 4);
		expect(picked.verdict).toBe('in');
	});

	it('leaves intents without a step alone', () => {
		const parsed = parsePhrase('note seal weeping', { steps });
		expect(withStep(parsed, steps[0])).toBe(parsed);
	});
});
