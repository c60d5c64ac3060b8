import { describe, expect, it } from 'vitest';
import { hasNul } from './nul';

describe('hasNul', () => {
	it('finds U+0000 in a string, deep in arrays and objects, and in keys', () => {
		expect(hasNul('rear axle 80 Nm\u0000')).toBe(true);
		expect(hasNul({ a: [1, { b: 'x\u0000y' }] })).toBe(true);
		expect(hasNul({ ['k\u0000']: 1 })).toBe(true);
	});

	it('passes text without it, other control characters and non-strings', () => {
		expect(hasNul('rear axle 80 Nm')).toBe(false);
		expect(hasNul('tab\there, line\nbreak, \u0001, \u202e')).toBe(false);
		expect(hasNul({ a: [1, null, true, { b: 'ok' }] })).toBe(false);
		expect(hasNul(null)).toBe(false);
		expect(hasNul(0)).toBe(false);
	});
});
