import { describe, expect, it } from 'vitest';
import { specText } from './report';

describe('spec text on the work report', () => {
	it('prints a band, one-sided limits, a nominal and a check without a value', () => {
		expect(specText({ unit: 'N.m', nominal: 24, min: 22, max: 26 })).toBe('22–26 N·m (nominal 24)');
		expect(specText({ unit: 'L', nominal: null, min: 1, max: null })).toBe('at least 1 L');
		expect(specText({ unit: 'mm', nominal: null, min: null, max: 0.15 })).toBe('at most 0.15 mm');
		expect(specText({ unit: 'kPa', nominal: 200, min: null, max: null })).toBe('200 kPa nominal');
		expect(specText({ unit: null, nominal: null, min: null, max: null })).toBe(
			'no value (check only)'
		);
	});
});
