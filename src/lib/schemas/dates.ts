// The window of dates Benchcall stores. PostgreSQL takes years from 4713 BC to 294276 AD and
// JavaScript's Date up to +275760, but a job, an approval, a calibration or an entry outside
// these years is a typing slip or a device clock gone wrong: refused with words, never stored
// as another date and never a 500.
export const EARLIEST = new Date('2000-01-01T00:00:00Z');
export const LATEST = new Date('2100-12-31T23:59:59Z');

export const outOfWindow = 'Give a date between the years 2000 and 2100.';

/** A date in the window; false for an invalid date too. */
export function inWindow(d: Date): boolean {
	const t = d.getTime();
	return Number.isFinite(t) && t >= EARLIEST.getTime() && t <= LATEST.getTime();
}

/** A typed date or date-time read strictly: a four-digit year, nothing JavaScript guesses at. */
export function readDate(text: string): Date | null {
	if (
		!/^\d{4}-\d{2}-\d{2}(?:[T ]\d{2}:\d{2}(?::\d{2}(?:\.\d{1,9})?)?(?:Z|[+-]\d{2}:?\d{2})?)?$/.test(
			text
		)
	)
		return null;
	const d = new Date(text);
	return Number.isNaN(d.getTime()) ? null : d;
}

/**
 * How far before its job card was opened an entry may be dated: work begun the evening before
 * the card was typed up the next morning (our rule, not a standard). Earlier is a slip of the
 * tongue ("yesterday at …" meant today) or a device clock gone wrong.
 */
export const BACKDATE_BEFORE_OPENING_MS = 24 * 60 * 60_000;

export const beforeOpeningMessage =
	'That time is more than a day before this job card was opened: nothing was logged. Say the time again, or log it without one.';

/** True when an entry dated `at` lies further before the job's opening than allowed. */
export function beforeOpening(at: Date, openedAt: Date): boolean {
	return at.getTime() < openedAt.getTime() - BACKDATE_BEFORE_OPENING_MS;
}
