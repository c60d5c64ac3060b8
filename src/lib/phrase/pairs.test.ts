// Engine speeds said in pairs, as workshops say them: "thirteen fifty" for 1350 rpm (common
// practice, like "eleven hundred" for 1100). Never keep the last number of two silently.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parsePhrase, type StepSpec } from './index';
import { numbersInNames } from './pairs';

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

describe('numbers in step names', () => {
	// the rule as a pattern: a number standing alone, or after '#' or '-', then a space or the end
	const inName = (names: string[], decimal: string) =>
		names.some((l) => new RegExp(`(^|[\\s#-])${decimal.replace('.', '\\.')}($|\\s)`).test(l));

	it('finds the same numbers as the pattern, read once per vocabulary', () => {
		const names = ['Upper caliper screw 1234', 'Brake pad #2 thickness', 'Cylinder 1-2 gap 0.15'];
		const set = numbersInNames(names.map((label) => ({ label })));
		for (const decimal of ['1234', '2', '1', '0.15', '12', '34', '-2', '15', '3']) {
			expect(set.has(decimal), decimal).toBe(inName(names, decimal));
		}
		fc.assert(
			fc.property(
				fc.array(fc.stringMatching(/^[a-z0-9 #.-]{0,12}$/), { maxLength: 4 }),
				fc.stringMatching(/^-?\d{1,3}(\.\d{1,2})?$/),
				(labels, decimal) => {
					const set = numbersInNames(labels.map((label) => ({ label })));
					expect(set.has(decimal)).toBe(inName(labels, decimal));
				}
			),
			{ numRuns: 2000 }
		);
	});
});
