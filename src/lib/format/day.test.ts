import { describe, expect, it } from 'vitest';
import { calendarDay, dayStartIn } from './day';

describe('a calendar day in the shop’s language', () => {
	it('is the same day whatever the zone the page runs in', () => {
		expect(calendarDay('en-GB', '2026-12-02')).toBe('2 Dec 2026');
		expect(calendarDay('de-DE', '2026-12-02')).toBe('02.12.2026');
		expect(calendarDay('en-GB', 'not a day')).toBe('not a day');
	});
});

describe('the first instant of a day in a time zone', () => {
	// Offsets from the IANA time zone database (tzdata, as ICU ships it): London GMT in winter and
	// BST (+1) in summer; New York EST (−5) in December; Auckland NZDT (+13) in December; Berlin
	// springs forward at 02:00 on the last Sunday of March, so its midnight on 2026-03-29 is still +1.
	it.each([
		['Europe/London', '2026-12-04', '2026-12-04T00:00:00.000Z'],
		['Europe/London', '2026-07-01', '2026-06-30T23:00:00.000Z'],
		['America/New_York', '2026-12-03', '2026-12-03T05:00:00.000Z'],
		['Pacific/Auckland', '2026-12-04', '2026-12-03T11:00:00.000Z'],
		['Europe/Berlin', '2026-03-29', '2026-03-28T23:00:00.000Z'],
		['Europe/Berlin', '2026-03-30', '2026-03-29T22:00:00.000Z'],
		['Asia/Kolkata', '2026-12-04', '2026-12-03T18:30:00.000Z'],
		['UTC', '2026-12-04', '2026-12-04T00:00:00.000Z']
	])('%s %s starts at %s', (zone, day, start) => {
		expect(dayStartIn(day, zone)?.toISOString()).toBe(start);
	});

	it('is the day’s first instant on the wall clock, on every day of a year, in zones with clock changes', () => {
		// Checked against Intl's own wall clock: the instant is on the day, the one before it not.
		for (const zone of [
			'America/Santiago',
			'Europe/Berlin',
			'Australia/Lord_Howe',
			'America/Havana'
		]) {
			const wall = new Intl.DateTimeFormat('en-CA', {
				timeZone: zone,
				year: 'numeric',
				month: '2-digit',
				day: '2-digit'
			});
			for (let d = Date.UTC(2026, 0, 1); d < Date.UTC(2027, 0, 1); d += 86_400_000) {
				const day = new Date(d).toISOString().slice(0, 10);
				const start = dayStartIn(day, zone)!;
				expect(wall.format(start)).toBe(day);
				expect(wall.format(start.getTime() - 60_000)).not.toBe(day);
			}
		}
	});

	it('is null for a day that does not exist or an unknown zone', () => {
		expect(dayStartIn('2026-02-30', 'UTC')).toBeNull();
		expect(dayStartIn('04/12/2026', 'UTC')).toBeNull();
		expect(dayStartIn('2026-12-04', 'Mars/Olympus_Mons')).toBeNull();
	});
});
