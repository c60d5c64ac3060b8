import { describe, expect, it } from 'vitest';
import { sinceLabel } from './labels';

describe('sinceLabel', () => {
	const now = new Date('2026-12-02T10:00:00Z');
	it('says a dash when there was nothing yet', () => {
		expect(sinceLabel(null, now)).toBe('—');
	});
	it('counts minutes, hours and days', () => {
		expect(sinceLabel(new Date('2026-12-02T09:59:40Z'), now)).toBe('just now');
		expect(sinceLabel(new Date('2026-12-02T09:48:00Z'), now)).toBe('12 min');
		expect(sinceLabel(new Date('2026-12-02T07:00:00Z'), now)).toBe('3 h');
		expect(sinceLabel(new Date('2026-12-02T06:55:00Z'), now)).toBe('3 h 5 min');
		expect(sinceLabel(new Date('2026-11-29T09:00:00Z'), now)).toBe('3 d');
	});
	it('never shows a negative time for a clock that runs ahead', () => {
		expect(sinceLabel(new Date('2026-12-02T10:05:00Z'), now)).toBe('just now');
	});
});
