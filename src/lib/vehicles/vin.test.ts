import { describe, expect, it } from 'vitest';
import { checkVin, normalizeRegistration, normalizeVin, vinCheckDigit } from './vin';

describe('VIN check digit', () => {
	it('matches the published worked example', () => {
		// The example VIN 1M8GDM9AXKP042788 with check digit X, as worked through in the
		// Wikipedia article "Vehicle identification number" (check-digit calculation section,
		// which follows 49 CFR 565.15 and its weights 8,7,6,5,4,3,2,10,0,9,…,2) — from memory of
		// that published example.
		expect(vinCheckDigit('1M8GDM9AXKP042788')).toBe('X');
		expect(checkVin('1M8GDM9AXKP042788').warnings).toEqual([]);
	});

	it('warns, and does not refuse, when the check digit differs', () => {
		// Same example with the 9th character changed: the sum mod 11 is still 10 → X expected.
		const r = checkVin('1m8gdm9a3kp042788');
		expect(r.vin).toBe('1M8GDM9A3KP042788');
		expect(r.warnings).toHaveLength(1);
		expect(r.warnings[0]).toMatch(/should be X/);
	});

	it('says when letters I, O or Q or the length are wrong', () => {
		expect(checkVin('1M8GDM9AXKPO42788').warnings[0]).toMatch(/I, O or Q/);
		expect(checkVin('JX1234').warnings[0]).toMatch(/17 characters; this has 6/);
		expect(checkVin('').warnings).toEqual([]);
	});

	it('ignores spaces, dashes and case', () => {
		expect(normalizeVin(' 1m8-gdm9ax kp042788 ')).toBe('1M8GDM9AXKP042788');
	});
});

describe('registrations', () => {
	it('compare without spaces, dashes or case', () => {
		expect(normalizeRegistration('ab 12-cde')).toBe(normalizeRegistration('AB12 CDE'));
		expect(normalizeRegistration('  kt 23  xyz ')).toBe('KT23XYZ');
	});
});
