/**
 * A calendar day ('2026-12-02', a date column) in the shop's language. Read in UTC on purpose:
 * a day has no time zone, and the shop's zone would show a western shop the day before.
 */
export function calendarDay(locale: string, day: string): string {
	const d = new Date(`${day.slice(0, 10)}T00:00:00Z`);
	if (Number.isNaN(d.getTime())) return day;
	return new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeZone: 'UTC' }).format(d);
}
