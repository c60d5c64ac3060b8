import { describe, expect, it } from 'vitest';
import { DEFAULT_DAYS, driftWindow, MAX_DAYS } from './drift-window';

const now = new Date('2026-12-04T06:00:00Z');

describe('drift window', () => {
	it('defaults to the last 90 days up to now', () => {
		const w = driftWindow({}, now);
		expect(w).toMatchObject({ ok: true, days: DEFAULT_DAYS, custom: false, to: now });
		if (w.ok) expect(w.from.toISOString()).toBe('2026-09-05T06:00:00.000Z');
	});

	it('takes whole UTC days, both included', () => {
		const w = driftWindow({ from: '2026-11-01', to: '2026-11-30' }, now);
		expect(w).toMatchObject({ ok: true, days: 30, custom: true });
		if (w.ok) {
			expect(w.from.toISOString()).toBe('2026-11-01T00:00:00.000Z');
			expect(w.to.toISOString()).toBe('2026-12-01T00:00:00.000Z');
		}
		expect(driftWindow({ from: '2026-11-30', to: '2026-11-30' }, now)).toMatchObject({ days: 1 });
	});

	it('answers a reversed, malformed or enormous window with words', () => {
		const reversed = driftWindow({ from: '2026-11-30', to: '2026-11-01' }, now);
		expect(reversed).toEqual({
			ok: false,
			message: 'The window ends (2026-11-01) before it starts (2026-11-30): swap the dates.'
		});
		expect(driftWindow({ from: '2026-02-30' }, now)).toMatchObject({ ok: false });
		expect(driftWindow({ to: 'yesterday' }, now)).toMatchObject({ ok: false });
		const huge = driftWindow({ from: '1900-01-01', to: '2026-12-04' }, now);
		expect(huge.ok).toBe(false);
		if (!huge.ok) expect(huge.message).toContain(`at most ${MAX_DAYS} days`);
		expect(driftWindow({ from: '2024-12-04', to: '2026-12-04' }, now)).toMatchObject({
			ok: true,
			days: MAX_DAYS
		});
	});

	it('a start alone runs to now; an end alone starts 90 days before it', () => {
		expect(driftWindow({ from: '2026-12-01' }, now)).toMatchObject({ ok: true, days: 4, to: now });
		const w = driftWindow({ to: '2026-06-30' }, now);
		expect(w).toMatchObject({ ok: true, days: DEFAULT_DAYS });
	});
});

describe('drift window in the shop’s time zone', () => {
	it('runs from the shop’s midnight to its midnight, not UTC’s', () => {
		// New York is UTC−5 in December (tzdata): its 3 Dec is 05:00Z on the 3rd to 05:00Z on the 4th.
		const w = driftWindow({ from: '2026-12-03', to: '2026-12-03' }, now, 'America/New_York');
		expect(w).toMatchObject({ ok: true, days: 1 });
		if (w.ok) {
			expect(w.from.toISOString()).toBe('2026-12-03T05:00:00.000Z');
			expect(w.to.toISOString()).toBe('2026-12-04T05:00:00.000Z');
		}
	});

	it('counts calendar days across a clock change (Berlin, 29 Mar 2026: a 23-hour day)', () => {
		const w = driftWindow({ from: '2026-03-29', to: '2026-03-29' }, now, 'Europe/Berlin');
		expect(w).toMatchObject({ ok: true, days: 1 });
		if (w.ok) expect(w.to.getTime() - w.from.getTime()).toBe(23 * 3_600_000);
		expect(
			driftWindow({ from: '2024-12-04', to: '2026-12-04' }, now, 'Europe/Berlin')
		).toMatchObject({ ok: true, days: MAX_DAYS });
	});
});
