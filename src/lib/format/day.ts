/**
 * A calendar day ('2026-12-02', a date column) in the shop's language. Read in UTC on purpose:
 * a day has no time zone, and the shop's zone would show a western shop the day before.
 */
export function calendarDay(locale: string, day: string): string {
	const d = new Date(`${day.slice(0, 10)}T00:00:00Z`);
	if (Number.isNaN(d.getTime())) return day;
	return new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeZone: 'UTC' }).format(d);
}

const wallClock = new Map<string, Intl.DateTimeFormat>();

/** How far the zone's wall clock is ahead of UTC at instant `t` (ms; negative west of UTC). */
function zoneOffset(t: number, timeZone: string): number {
	let f = wallClock.get(timeZone);
	if (!f) {
		f = new Intl.DateTimeFormat('en-US', {
			timeZone,
			hourCycle: 'h23',
			year: 'numeric',
			month: 'numeric',
			day: 'numeric',
			hour: 'numeric',
			minute: 'numeric',
			second: 'numeric'
		});
		wallClock.set(timeZone, f);
	}
	const p = Object.fromEntries(f.formatToParts(t).map((x) => [x.type, Number(x.value)]));
	const asUtc = Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute, p.second);
	return asUtc - (t - (t % 1000));
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
	if (!/^\d{4}-\d{2}-\d{2}$/.test(ymd)) return null;
	const utcMidnight = Date.parse(`${ymd}T00:00:00Z`);
	if (Number.isNaN(utcMidnight) || new Date(utcMidnight).toISOString().slice(0, 10) !== ymd) {
		return null;
	}
	try {
		// Two guesses: the zone's offset at UTC midnight, and at the first guess (they differ on a
		// day the clocks change); the earliest that falls on the day is its start.
		const first = utcMidnight - zoneOffset(utcMidnight, timeZone);
		const second = utcMidnight - zoneOffset(first, timeZone);
		const onDay = [first, second].filter((t) => dayIn(t, timeZone) === ymd);
		return new Date(onDay.length ? Math.min(...onDay) : first);
	} catch {
		return null;
	}
}
