import { describe, expect, it } from 'vitest';
import { BRAKE_FLUIDS, formatGrade, judgeGrade, parseFluidSpec } from './fluid';

describe('parseFluidSpec', () => {
	it('reads a spec as a manual writes it (common practice wording)', () => {
		const s = parseFluidSpec('SAE 10W-30, API SJ or higher, JASO MA');
		expect(s).toEqual({ sae: ['10W-30'], api: 'SJ', jaso: 'MA', dot: null, problems: [] });
		expect(formatGrade(s!, ', ')).toBe('SAE 10W-30, API SJ, JASO MA');
		expect(parseFluidSpec('SAE 10W-30 or 10W-40, JASO MA2')?.sae).toEqual(['10W-30', '10W-40']);
		expect(parseFluidSpec('DOT 4')?.dot).toBe('4');
		expect(parseFluidSpec('SAE 40')?.sae).toEqual(['SAE 40']);
		expect(parseFluidSpec('')).toBeNull();
	});

	it('reports a spec that is not a grade', () => {
		expect(parseFluidSpec('15W-35')?.problems[0]).toContain('not an SAE J300 grade');
		expect(parseFluidSpec('DOT 6')?.problems[0]).toContain('not a brake fluid class');
		expect(parseFluidSpec('the good stuff')?.problems[0]).toContain('No fluid grade found');
	});
});

describe('judgeGrade', () => {
	it('FMVSS 116 minimum boiling points order DOT 3 < DOT 4 < DOT 5.1 (values from memory)', () => {
		expect(BRAKE_FLUIDS['3']).toMatchObject({ dry: 205, wet: 140 });
		expect(BRAKE_FLUIDS['4']).toMatchObject({ dry: 230, wet: 155 });
		expect(BRAKE_FLUIDS['5.1']).toMatchObject({ dry: 260, wet: 180 });
		const spec = parseFluidSpec('DOT 3')!;
		expect(judgeGrade(spec, parseFluidSpec('DOT 4')!).verdict).toBe('meets');
		expect(judgeGrade(spec, parseFluidSpec('DOT 5.1')!).verdict).toBe('meets');
		expect(judgeGrade(spec, parseFluidSpec('DOT 5')!).verdict).toBe('fails');
	});

	it('engine oil into a brake system and brake fluid into an engine both fail', () => {
		expect(judgeGrade(parseFluidSpec('DOT 4')!, parseFluidSpec('10W-30')!).verdict).toBe('fails');
		expect(judgeGrade(parseFluidSpec('10W-30')!, parseFluidSpec('DOT 4')!).verdict).toBe('fails');
	});

	it('"SAE 10W-30, API SJ, JASO MA" meets its own spec (valid J300/API/JASO triple, common practice)', () => {
		const g = parseFluidSpec('SAE 10W-30, API SJ, JASO MA')!;
		expect(judgeGrade(g, g)).toEqual({ verdict: 'meets', reasons: [], caution: null });
	});
});
