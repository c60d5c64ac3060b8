import { describe, expect, it } from 'vitest';
import { clockTime, msToHours, workedMs } from './labour';

const at = (hhmm: string) => new Date(`2026-12-01T${hhmm}:00Z`);

describe('clock-time labour', () => {
	it('runs from the first entry to the last when no gap is long', () => {
		// By hand: 09:00 → 09:20 → 09:45 → 10:30 = 20 + 25 + 45 = 90 min = 1.5 h.
		const r = workedMs([at('09:00'), at('09:20'), at('09:45'), at('10:30')], 60);
		expect(r).toEqual({ ms: 90 * 60_000, gaps: 0 });
	});
	it('leaves out a gap longer than the idle limit, keeps one exactly at it', () => {
		// 09:00 → 09:30 (30, kept: not over 30) → 11:00 (90, left out) → 11:15 (15) = 45 min.
		const r = workedMs([at('11:00'), at('09:00'), at('11:15'), at('09:30')], 30);
		expect(r).toEqual({ ms: 45 * 60_000, gaps: 1 });
		expect(msToHours(r.ms)).toBe(0.75);
	});
	it('gives each technician their own time', () => {
		const rows = clockTime(
			[
				{ authorId: 'a', occurredAt: at('09:00') },
				{ authorId: 'b', occurredAt: at('09:10') },
				{ authorId: 'a', occurredAt: at('09:25') },
				{ authorId: 'b', occurredAt: at('09:30') },
				{ authorId: 'a', occurredAt: at('13:00') }
			],
			30
		);
		// a: 09:00→09:25 = 25 min (the 215-min gap to 13:00 is left out) = 0.42 h (0.41666… up).
		// b: 09:10→09:30 = 20 min = 0.33 h.
		expect(rows.map((r) => [r.authorId, r.ms / 60_000, r.hours, r.gapsLeftOut])).toEqual([
			['a', 25, 0.42, 1],
			['b', 20, 0.33, 0]
		]);
	});
	it('counts nothing for a single entry and refuses a negative idle gap', () => {
		expect(workedMs([at('09:00')], 30)).toEqual({ ms: 0, gaps: 0 });
		expect(() => workedMs([], -1)).toThrow(/idle gap/);
	});
	it('rounds hours to hundredths, halves up', () => {
		// 27 min = 0.45 h exactly; 1 min = 0.01666… → 0.02; 30 s = 0.00833… → 0.01.
		expect(msToHours(27 * 60_000)).toBe(0.45);
		expect(msToHours(60_000)).toBe(0.02);
		expect(msToHours(30_000)).toBe(0.01);
	});
});
