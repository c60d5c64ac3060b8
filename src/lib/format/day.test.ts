import { describe, expect, it } from 'vitest';
import { calendarDay } from './day';

describe('a calendar day in the shop’s language', () => {
	it('is the same day whatever the zone the page runs in', () => {
		expect(calendarDay('en-GB', '2026-12-02')).toBe('2 Dec 2026');
		expect(calendarDay('de-DE', '2026-12-02')).toBe('02.12.2026');
		expect(calendarDay('en-GB', 'not a day')).toBe('not a day');
	});
});
