// Engine speeds said in pairs, as workshops say them: "thirteen fifty" for 1350 rpm (common
// practice, like "eleven hundred" for 1100). Never keep the last number of two silently.
import { describe, expect, it } from 'vitest';
import { parsePhrase, type StepSpec } from './index';

// Demo values, invented for the test: idle 1300–1500 rpm; a torque step for contrast.
const steps: StepSpec[] = [
	{ id: 'idle', label: 'Idle speed', unit: '/min', min: 1300, max: 1500 },
	{ id: 'axle', label: 'Rear axle nut', unit: 'N.m', min: 80, max: 96 }
];
const p = (text: string) => parsePhrase(text, { steps, tolerancePct: 10 });

describe('revs said in pairs', () => {
	it('reads "thirteen fifty r p m" and "13 50 rpm" as 1350', () => {
		for (const text of [
			'idle speed thirteen fifty r p m',
			'idle speed 13 50 rpm',
			'idle speed thirteen fifty',
			'idle 14 05 rpm'
		]) {
			const r = p(text);
			expect(r.intent, text).toBe('measure');
			expect(r.stepId, text).toBe('idle');
			expect(r.quantity?.unit, text).toBe('/min');
			expect(r.verdict, text).toBe('in');
		}
		expect(p('idle speed 13 50 rpm').quantity?.value).toBe(1350);
		expect(p('idle 14 05 rpm').quantity?.value).toBe(1405);
	});

	it('asks rather than keeping the last of two numbers that are not a pair', () => {
		const r = p('rear axle nut 88 92 nm');
		expect(r.quantity?.value).not.toBe(92);
		expect(r.verdict).toBeNull();
		expect(r.problems.join(' ')).toMatch(/two numbers/i);
	});

	it('leaves a single number and step numbers alone', () => {
		expect(p('idle speed 1350 rpm').quantity?.value).toBe(1350);
		expect(p('idle fourteen hundred').quantity?.value).toBe(1400);
		expect(p('rear axle nut 88 nm').quantity?.value).toBe(88);
	});
});
