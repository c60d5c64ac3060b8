import * as chrono from 'chrono-node';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { clockInstant, extractTime, type Meridiem } from './time';

// The oracle: chrono-node, a general-purpose natural-language date parser from npm, reading
// the same clause in a zone of the same fixed offset. The phrase engine works the instant out
// itself because chrono costs more than the whole rest of a phrase's parse.
function chronoInstant(
	now: Date,
	offset: number,
	t: { yesterday: boolean; hour: number; minute: number; meridiem: Meridiem }
): number | null {
	const text = `${t.yesterday ? 'yesterday' : 'today'} at ${t.hour}:${String(t.minute).padStart(2, '0')}${t.meridiem ? ' ' + t.meridiem : ''}`;
	return (
		chrono.parseDate(text, { instant: now, timezone: offset }, { forwardDate: false })?.getTime() ??
		null
	);
}

const OFFSETS = [0, 60, 120, -300, -570, 330, 345, 630, 780, -720];

describe('clockInstant agrees with chrono-node', () => {
	it('on every valid clock time, today and yesterday, 24-hour and am/pm', () => {
		let checked = 0;
		for (const [now, offset] of [
			[new Date('2026-12-02T09:07:31.456Z'), 60],
			[new Date('2026-03-29T00:30:12.345Z'), -300]
		] as const) {
			for (const yesterday of [false, true]) {
				for (let minute = 0; minute < 60; minute++) {
					for (let hour = 0; hour < 24; hour++) {
						const t = { yesterday, hour, minute, meridiem: '' as const };
						expect(clockInstant(now, offset, t)).toBe(chronoInstant(now, offset, t));
						checked++;
					}
					for (const meridiem of ['am', 'pm'] as const) {
						for (let hour = 0; hour <= 12; hour++) {
							const t = { yesterday, hour, minute, meridiem };
							expect(clockInstant(now, offset, t)).toBe(chronoInstant(now, offset, t));
							checked++;
						}
					}
				}
			}
		}
		expect(checked).toBe(2 * 2 * 60 * (24 + 26));
	});

	it('at any instant and offset, across month and year ends', () => {
		fc.assert(
			fc.property(
				fc.integer({ min: Date.UTC(2020, 0, 1), max: Date.UTC(2032, 0, 1) }),
				fc.constantFrom(...OFFSETS),
				fc.boolean(),
				fc.integer({ min: 0, max: 23 }),
				fc.integer({ min: 0, max: 59 }),
				(ms, offset, yesterday, hour, minute) => {
					const now = new Date(ms);
					const t = { yesterday, hour, minute, meridiem: '' as const };
					expect(clockInstant(now, offset, t)).toBe(chronoInstant(now, offset, t));
				}
			),
			{ numRuns: 400 }
		);
		// the first of a month and of a year, just after local midnight: yesterday is last month
		const newYear = new Date('2027-01-01T00:10:00Z');
		const t = { yesterday: true, hour: 23, minute: 50, meridiem: '' as const };
		expect(clockInstant(newYear, 0, t)).toBe(Date.UTC(2026, 11, 31, 23, 50));
		expect(clockInstant(newYear, 0, t)).toBe(chronoInstant(newYear, 0, t));
	});

	it('a time no clock shows is null, never the current time', () => {
		const now = new Date('2026-12-02T09:00:00Z');
		for (const [hour, minute, meridiem] of [
			[24, 0, ''],
			[25, 0, ''],
			[8, 60, ''],
			[13, 0, 'pm'],
			[16, 5, 'pm'],
			[80, 0, 'am']
		] as const) {
			expect(clockInstant(now, 0, { yesterday: false, hour, minute, meridiem })).toBeNull();
		}
	});
});

describe('extractTime', () => {
	const now = new Date('2026-12-02T09:07:31.456Z');

	it('"… ago" counts back from now to the millisecond, as chrono-node does', () => {
		for (const [clause, canonical] of [
			['5 minutes ago', '5 minutes ago'],
			['twenty five mins ago', '25 minutes ago'],
			['an hour ago', '1 hours ago'],
			['a couple of hours ago', '2 hours ago'],
			['a few seconds ago', '3 seconds ago'],
			['half an hour ago', '30 minutes ago'],
			['999 hrs ago', '999 hours ago']
		]) {
			const r = extractTime(`oil 1 l ${clause}`, now, 'UTC');
			expect(r.rest).toBe('oil 1 l');
			const expected = chrono.parseDate(canonical, { instant: now, timezone: 0 });
			expect(r.occurredAt).toBe(expected?.toISOString());
		}
	});

	it('"at 25:00" is a problem, not a back-date to now', () => {
		const r = extractTime('chain slack 30 mm at 25:00', now, 'UTC');
		expect(r.occurredAt).toBeNull();
		expect(r.rest).toBe('chain slack 30 mm');
		expect(r.problems).toEqual(["Could not read the time 'at 25:00'."]);
	});

	it('a phrase without a time clause is left whole', () => {
		expect(extractTime('rear axle nut torqued at 80', now, 'UTC')).toEqual({
			rest: 'rear axle nut torqued at 80',
			occurredAt: null,
			problems: []
		});
	});
});
