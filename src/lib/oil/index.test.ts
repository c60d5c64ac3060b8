import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	isJ300Multigrade,
	parseOilGrade,
	parseSaeGrade,
	satisfiesApi,
	satisfiesJaso
} from './index';

describe('parseOilGrade', () => {
	it('reads "SAE 10W-30, API SJ, JASO MA" as a valid triple', () => {
		// common practice: a motorcycle oil specification as printed in service manuals
		// (grades exist per SAE J300, API categories, JASO T 903)
		const g = parseOilGrade('SAE 10W-30, API SJ, JASO MA');
		expect(g.valid).toBe(true);
		expect(g.sae).toEqual({ winter: 10, hot: 30, text: '10W-30' });
		expect(g.api).toBe('SJ');
		expect(g.jaso).toBe('MA');
		expect(g.problems).toEqual([]);
		expect(g.warnings).toEqual([]);
	});

	it('reads "10W-30 SJ MA2" as valid (a grade a workshop writes; JASO T 903 MA2 sub-band)', () => {
		const g = parseOilGrade('10W-30 SJ MA2');
		expect(g.valid).toBe(true);
		expect(g.sae?.text).toBe('10W-30');
		expect(g.api).toBe('SJ');
		expect(g.jaso).toBe('MA2');
	});

	it('accepts written variants', () => {
		expect(parseOilGrade('10w40').sae?.text).toBe('10W-40');
		expect(parseOilGrade('10W/40 API SN PLUS').api).toBe('SN PLUS');
		expect(parseOilGrade('20W‑50 JASO MA1').sae?.text).toBe('20W-50');
		expect(parseOilGrade('SAE 40').sae).toEqual({ winter: null, hot: 40, text: '40' });
		expect(parseOilGrade('jaso fc').jaso).toBe('FC');
	});

	it('rejects 25W-20: not an SAE J300 grade', () => {
		// SAE J300 (2015 table): 25W needs ≥ 9.3 mm²/s at 100 °C, grade 20 is below 9.3
		const g = parseOilGrade('25W-20');
		expect(g.valid).toBe(false);
		expect(g.sae).toBeNull();
		expect(g.problems[0]).toMatch(/25W-20 is not an SAE J300 grade/);
		expect(parseSaeGrade('25W-20').grade !== null).toBe(false);
	});

	it('rejects numbers outside the J300 tables', () => {
		// SAE J300 winter grades 0W…25W, hot grades 8…60 (SAE J300, 2015 table as reproduced)
		expect(parseOilGrade('7W-30').problems[0]).toMatch(/7W is not a winter grade/);
		expect(parseOilGrade('10W-35').problems[0]).toMatch(/35 is not a viscosity grade/);
		expect(parseOilGrade('SAE 35').valid).toBe(false);
		expect(parseOilGrade('35W').valid).toBe(false);
	});

	it('warns that MB is not for wet clutches (JASO T 903)', () => {
		const g = parseOilGrade('10W-40 SL MB');
		expect(g.valid).toBe(true);
		expect(g.jaso).toBe('MB');
		expect(g.warnings[0]).toMatch(/not for wet clutches/);
	});

	it('knows API S categories: SI and SK never issued, SA…SH obsolete', () => {
		// API gasoline category sequence (API 1509 service categories: SJ, SL, SM, SN, SP, SQ; SI and SK skipped)
		expect(parseOilGrade('API SK').problems[0]).toMatch(/never issued/);
		expect(parseOilGrade('API SI').valid).toBe(false);
		const old = parseOilGrade('20W-50 API SG');
		expect(old.valid).toBe(true);
		expect(old.warnings[0]).toMatch(/obsolete/);
		expect(parseOilGrade('API CK-4').problems[0]).toMatch(/not an API gasoline/);
	});

	it('gives a clear message for empty or unrelated text, never throws', () => {
		expect(parseOilGrade('').problems[0]).toMatch(/No oil grade given/);
		expect(parseOilGrade('blue bottle').problems[0]).toMatch(/No SAE, API or JASO grade/);
		fc.assert(
			fc.property(fc.string({ unit: 'binary', maxLength: 300 }), (s) => {
				const g = parseOilGrade(s);
				expect(typeof g.valid).toBe('boolean');
			}),
			{ numRuns: 300 }
		);
	}, 30_000); // 300 generated strings: seconds on a busy shared machine, not a timing check
});

describe('J300 multigrades', () => {
	it('accepts the common motorcycle grades and rules out impossible ones', () => {
		// SAE J300 2015 table, kinematic viscosity limits at 100 °C [MEM]
		for (const g of [
			'0W-20',
			'5W-30',
			'10W-30',
			'10W-40',
			'15W-50',
			'20W-50',
			'20W-20',
			'25W-60'
		]) {
			expect(parseSaeGrade(g).grade !== null, g).toBe(true);
		}
		expect(isJ300Multigrade(25, 20)).toBe(false);
		expect(isJ300Multigrade(25, 16)).toBe(false);
		expect(isJ300Multigrade(25, 30)).toBe(true);
	});
});

describe('requirements', () => {
	it('MA1 and MA2 satisfy MA; MB does not (JASO T 903)', () => {
		expect(satisfiesJaso('MA', 'MA2')).toBe(true);
		expect(satisfiesJaso('MA', 'MA1')).toBe(true);
		expect(satisfiesJaso('MA', 'MB')).toBe(false);
		expect(satisfiesJaso('MA2', 'MA')).toBe(false);
	});

	it('a later API category covers an earlier one', () => {
		expect(satisfiesApi('SJ', 'SN')).toBe(true);
		expect(satisfiesApi('SL', 'SJ')).toBe(false);
		expect(satisfiesApi('SN', 'SN PLUS')).toBe(true);
		expect(satisfiesApi('SJ', 'XX')).toBe(false);
	});
});
