import { zoneOffsetMinutes } from '$lib/phrase/time';

/**
 * A calendar day ('2026-12-02', a date column) in the shop's language. Read in UTC on purpose:
 * a day has no time zone, and the shop's zone would show a western shop the day before.
 */
export function calendarDay(locale: string, day: string): string {
	const d = new Date(`${day.slice(0, 10)}T00:00:00Z`);
	if (Number.isNaN(d.getTime())) return day;
	return new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeZone: 'UTC' }).format(d);
}

/** How far the zone's wall clock is ahead of UTC at instant `t` (ms; negative west of UTC). */
function zoneOffset(t: number, timeZone: string): number {
	return zoneOffsetMinutes(new Date(t), timeZone) * 60_000;
}

/** The day (YYYY-MM-DD) and the minutes after its midnight that the zone's clocks show at `t`. */
export function wallClockOf(t: number, timeZone: string): { day: string; minutes: number } {
	const wall = new Date(t + zoneOffset(t, timeZone));
	return {
		day: wall.toISOString().slice(0, 10),
		minutes: wall.getUTCHours() * 60 + wall.getUTCMinutes()
	};
}

/** The calendar day (YYYY-MM-DD) of instant `t` on the zone's wall clock. */
function dayIn(t: number, timeZone: string): string {
	return new Date(t + zoneOffset(t, timeZone)).toISOString().slice(0, 10);
}

/**
 * The first instant of calendar day `ymd` (YYYY-MM-DD) in an IANA time zone: its midnight, or
 * the first minute after it where the clocks skip midnight (a spring-forward at 00:00). Null
 * for a day that does not exist (2026-02-30) or an unknown zone.
 */
export function dayStartIn(ymd: string, timeZone: string): Date | null {
	return wallTimeIn(ymd, 0, timeZone);
}

/**
 * The instant the zone's clocks show `minutes` after midnight on day `ymd`. A time the clocks
 * skip (in a spring-forward) gives the first instant after the gap; a time they show twice (a
 * fall-back), the first of the two. Null for a day that does not exist or an unknown zone.
 */
export function wallTimeIn(ymd: string, minutes: number, timeZone: string): Date | null {
	if (!/^\d{4}-\d{2}-\d{2}$/.test(ymd)) return null;
	const utcMidnight = Date.parse(`${ymd}T00:00:00Z`);
	if (Number.isNaN(utcMidnight) || new Date(utcMidnight).toISOString().slice(0, 10) !== ymd) {
		return null;
	}
	const wall = utcMidnight + minutes * 60_000;
	try {
		// Two guesses: the zone's offset at the wall time read as UTC, and at the first guess (they
		// differ near a clock change). One that shows the wall time wins; else the earliest on the day.
		const first = wall - zoneOffset(wall, timeZone);
		const second = wall - zoneOffset(first, timeZone);
		const guesses = [first, second].sort((a, b) => a - b);
		const exact = guesses.find((t) => t + zoneOffset(t, timeZone) === wall);
		if (exact !== undefined) return new Date(exact);
		const onDay = guesses.filter((t) => dayIn(t, timeZone) === ymd);
		return new Date(onDay.length ? onDay[0] : first);
	} catch {
		return null;
	}
}
