import { describe, expect, it } from 'vitest';
import { withStep } from '../bench/choose';
import { parsePhrase, type StepSpec } from './index';

// Invented demo steps; the specs are written the way service manuals write them.
const STEPS: StepSpec[] = [
	{
		id: 'oil',
		label: 'Engine oil',
		unit: 'L',
		min: 1.1,
		max: 1.3,
		fluid: 'SAE 10W-30, API SJ or higher, JASO MA'
	},
	{
		id: 'oil2',
		label: 'Gearbox fill',
		unit: 'L',
		min: 0.8,
		max: 0.9,
		fluid: 'SAE 10W-40, JASO MA2'
	},
	{ id: 'brake', label: 'Front brake fluid', unit: 'mL', nominal: 100, fluid: 'DOT 4' },
	{ id: 'silicone', label: 'Clutch fluid', unit: 'mL', nominal: 60, fluid: 'DOT 5' },
	{ id: 'axle', label: 'Rear axle nut', unit: 'N.m', min: 80, max: 90 }
];
const p = (text: string) => parsePhrase(text, { steps: STEPS, timeZone: 'UTC' });

describe('fluid grade in a phrase', () => {
	it('the issue case: 10W-40 JASO MB into a 10W-30 JASO MA engine is in spec by quantity, fails by grade', () => {
		const r = p('oil 10W-40 JASO MB 1.2 L');
		expect(r.stepId).toBe('oil');
		expect(r.verdict).toBe('in'); // the quantity is judged as before, apart from the grade
		expect(r.fluid).toBe('SAE 10W-40 · JASO MB');
		expect(r.fluidVerdict).toBe('fails');
		// SAE J300: 10W-40 is not the grade the spec lists
		expect(r.problems.some((m) => m.includes('SAE 10W-40 is not a grade the spec lists'))).toBe(
			true
		);
		// JASO T 903: MB (low friction) never meets MA, and the wet-clutch caution is shown
		expect(r.problems.some((m) => m.startsWith('Caution: JASO MB'))).toBe(true);
	});

	it('reads the grade written loosely or spoken, before or after the quantity', () => {
		for (const text of [
			'oil 1.2 l 10w30 api sn jaso ma2',
			'engine oil ten w thirty api s n jaso m a two 1.2 litres',
			'oil sae 10w-30 sn ma2 1.2 l',
			'oil 10 w 30 API SN JASO MA 2 1.2 L'
		]) {
			const r = p(text);
			expect(r.stepId, text).toBe('oil');
			expect(r.quantity, text).toEqual({ value: 1.2, unit: 'L' });
			expect(r.fluid, text).toBe('SAE 10W-30 · API SN · JASO MA2');
			expect(r.fluidVerdict, text).toBe('meets');
			expect(r.problems, text).toEqual([]);
		}
	});

	it('API 1509: a later S category meets an earlier minimum, an earlier one does not', () => {
		expect(p('oil 10w-30 api sp jaso ma 1.2 l').fluidVerdict).toBe('meets'); // SP after SJ
		const old = p('oil 10w-30 api sh jaso ma 1.2 l'); // SH before SJ
		expect(old.fluidVerdict).toBe('fails');
		expect(old.problems[0]).toContain('API SH is older than the API SJ');
	});

	it('JASO T 903: MA accepts MA, MA1, MA2; MA2 accepts only MA2; MB never meets MA', () => {
		for (const cls of ['ma', 'ma1', 'ma2']) {
			expect(p(`oil 10w-30 jaso ${cls} 1.2 l`).fluidVerdict, cls).toBe('meets');
		}
		expect(p('gearbox fill 10w-40 jaso ma2 0.85 l').fluidVerdict).toBe('meets');
		const ma1 = p('gearbox fill 10w-40 jaso ma1 0.85 l');
		expect(ma1.fluidVerdict).toBe('fails');
		expect(ma1.problems.some((m) => m.startsWith('Caution: this engine has a wet clutch'))).toBe(
			true
		);
		expect(p('gearbox fill 10w-40 jaso ma 0.85 l').fluidVerdict).toBe('fails');
		expect(p('gearbox fill 10w-40 jaso mb 0.85 l').fluidVerdict).toBe('fails');
	});

	it('SAE J300: the stated grade must be one the spec lists', () => {
		const r = parsePhrase('oil 10w-40 1.2 l', {
			steps: [{ id: 'o', label: 'Oil', unit: 'L', fluid: 'SAE 10W-30 or 10W-40, JASO MA' }]
		});
		expect(r.fluidVerdict).toBe('meets');
		expect(p('oil 20w-50 jaso ma 1.2 l').fluidVerdict).toBe('fails');
	});

	it('FMVSS 116: DOT 5.1 meets DOT 4 (260/180 °C ≥ 230/155 °C), DOT 3 does not', () => {
		expect(p('front brake fluid dot 5.1 100 ml').fluidVerdict).toBe('meets');
		expect(p('front brake fluid dot five point one 100 ml').fluid).toBe('DOT 5.1');
		expect(p('front brake fluid dot4 100 ml').fluidVerdict).toBe('meets');
		const three = p('front brake fluid dot 3 100 ml');
		expect(three.fluidVerdict).toBe('fails');
		expect(three.problems[0]).toContain('205 / 140 °C against 230 / 155 °C');
	});

	it('common practice: silicone DOT 5 and the glycol classes never stand in for each other', () => {
		expect(p('front brake fluid dot 5 100 ml').fluidVerdict).toBe('fails');
		expect(p('clutch fluid dot 5.1 60 ml').fluidVerdict).toBe('fails');
		expect(p('clutch fluid dot 5 60 ml').fluidVerdict).toBe('meets');
	});

	it('asks for the grade when the step has a fluid spec and none was said; logging stays possible', () => {
		const r = p('oil 1.2 L');
		expect(r.intent).toBe('measure');
		expect(r.verdict).toBe('in');
		expect(r.fluid).toBeNull();
		expect(r.fluidVerdict).toBe('not_stated');
		expect(r.problems[0]).toMatch(/^Grade not stated: Engine oil calls for SAE 10W-30/);
	});

	it('has no grade verdict on a step without a fluid spec', () => {
		const r = p('rear axle 85 nm');
		expect(r.fluid).toBeNull();
		expect(r.fluidVerdict).toBeNull();
		expect(r.verdict).toBe('in');
	});

	it('"dot" as a spoken decimal point is not a brake fluid class', () => {
		const r = p('oil one dot two litres');
		expect(r.quantity).toEqual({ value: 1.2, unit: 'L' });
		expect(r.fluid).toBeNull();
	});

	it('an unknown grade is a clear problem, never a throw', () => {
		const cases: [string, string][] = [
			['oil 15W-35 1.2 l', '15W-35 is not an SAE J300 grade'],
			['oil api xy 1.2 l', 'API XY is not an API gasoline (S) category'],
			['front brake fluid dot 6 100 ml', 'DOT 6 is not a brake fluid class of FMVSS 116'],
			['oil jaso mz 1.2 l', 'JASO MZ is not a JASO class'],
			['oil 25w-20 1.2 l', 'a 25W oil is too thick at 100 °C to be a 20']
		];
		for (const [text, problem] of cases) {
			const r = p(text);
			expect(r.fluidVerdict, text).toBe('fails');
			expect(
				r.problems.filter((m) => m.includes(problem)),
				text
			).toHaveLength(1);
			expect(r.quantity, text).not.toBeNull();
		}
	});

	it('another step picked with the arrow keys judges the grade against that step', () => {
		const r = p('oil 10w-40 jaso ma2 1.2 l');
		expect(r.stepId).toBe('oil');
		expect(r.fluidVerdict).toBe('fails');
		const picked = withStep(r, STEPS[1] as StepSpec);
		expect(picked.fluidVerdict).toBe('meets');
		const unknown = withStep(p('oil dot 6 1.2 l'), STEPS[2] as StepSpec);
		expect(unknown.fluidVerdict).toBe('fails');
		expect(unknown.problems.some((m) => m.includes('DOT 6'))).toBe(true);
		expect(withStep(r, STEPS[4] as StepSpec).fluidVerdict).toBeNull();
	});
});
