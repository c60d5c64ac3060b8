// The time window of a spec-drift view. Pure: no framework imports.
//
// By default the last DEFAULT_DAYS days; when they hold fewer than MIN_READINGS readings the
// window reaches back further (the server widens it) so the statistics rest on enough readings.
// The foreman may set any window of whole days of the shop's time zone (its midnight to
// midnight, whatever the server's zone) up to MAX_DAYS long.
import { dayStartIn } from '$lib/format/day';

export const DEFAULT_DAYS = 90;
export const MIN_READINGS = 200;
/** Two years and a day: wide enough to compare this season with the last two. */
export const MAX_DAYS = 731;
/** The chart is never given more than about this many points. */
export const MAX_POINTS = 1000;
/** Runs of readings whose lowest and highest are drawn when there are more than MAX_POINTS. */
export const POINT_BUCKETS = 400;

const DAY = 86_400_000;

export type DriftWindow =
	| { ok: true; from: Date; to: Date; days: number; custom: boolean }
	| { ok: false; message: string };

/** The day after `ymd` (YYYY-MM-DD), counted on the calendar, not in hours. */
function nextDay(ymd: string): string {
	return new Date(Date.parse(`${ymd}T00:00:00Z`) + DAY).toISOString().slice(0, 10);
}

/**
 * The window for `from`/`to` (YYYY-MM-DD, both days included, in the shop's `timeZone`; either
 * may be missing), or a message saying what is wrong with them.
 */
export function driftWindow(
	input: { from?: string; to?: string },
	now: Date,
	timeZone = 'UTC'
): DriftWindow {
	const fromText = input.from?.trim() ?? '';
	const toText = input.to?.trim() ?? '';
	if (!fromText && !toText) {
		return {
			ok: true,
			from: new Date(now.getTime() - DEFAULT_DAYS * DAY),
			to: now,
			days: DEFAULT_DAYS,
			custom: false
		};
	}
	const from = fromText ? dayStartIn(fromText, timeZone) : null;
	const toDay = toText ? dayStartIn(toText, timeZone) : null;
	if ((fromText && !from) || (toText && !toDay)) {
		return { ok: false, message: 'Give the window’s days as dates (YYYY-MM-DD).' };
	}
	// `to` is the whole of its day (up to the next midnight: 23 or 25 hours on the days the clocks
	// change); a missing end is now, a missing start DEFAULT_DAYS before the end.
	const to = toDay ? dayStartIn(nextDay(toText), timeZone)! : now;
	const start = from ?? new Date(to.getTime() - DEFAULT_DAYS * DAY);
	if (start.getTime() >= to.getTime()) {
		return {
			ok: false,
			message: `The window ends (${toText || 'today'}) before it starts (${fromText}): swap the dates.`
		};
	}
	// Calendar days when both ends are days, so a clock change never adds one.
	const days =
		from && toDay
			? Math.round((Date.parse(nextDay(toText)) - Date.parse(fromText)) / DAY)
			: Math.ceil((to.getTime() - start.getTime()) / DAY);
	if (days > MAX_DAYS) {
		return {
			ok: false,
			message: `A window can span at most ${MAX_DAYS} days (two years); this one spans ${days.toLocaleString('en')}. Narrow it.`
		};
	}
	return { ok: true, from: start, to, days, custom: true };
}
