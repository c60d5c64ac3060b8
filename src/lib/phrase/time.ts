import { wordsToNumber } from './numbers';

/**
 * Back-dating: "… at 10:30", "… at 3 pm", "… yesterday at 16:05", "… 5 minutes ago",
 * "… twenty minutes ago", "… half an hour ago". The clause is cut out of the phrase by a narrow
 * pattern (so "torqued at 80" is never read as a time) and resolved against `now` in the shop's
 * time zone, with the zone's offset at `now`. The pattern has already read every field, so the
 * instant is worked out directly: a general date parser costs more than the rest of the phrase
 * (time.test.ts checks the result against chrono-node on the same clause).
 */

const NUM_WORD =
	'(?:(?:twenty|thirty|forty|fifty)[\\s-]?(?:one|two|three|four|five|six|seven|eight|nine)|' +
	'one|two|three|four|five|six|seven|eight|nine|ten|eleven|twelve|thirteen|fourteen|fifteen|' +
	'sixteen|seventeen|eighteen|nineteen|twenty|thirty|forty|fifty|sixty|ninety)';
const AGO_RE = new RegExp(
	`(?:^|\\s)((\\d{1,3}|${NUM_WORD}|an?|half an?|a couple of|a few)\\s*` +
		'(seconds?|secs?|minutes?|mins?|hours?|hrs?|hr|h)\\s+ago)(?=\\s|$|[.,!?])'
);
const CLOCK_RE =
	/(?:^|\s)((?:(yesterday|today)\s+)?(?:at\s+)?(?:(\d{1,2})(?::|h)(\d{2})\s*(am|pm|a\.m\.|p\.m\.)?|(\d{1,2})\s*(am|pm|a\.m\.|p\.m\.)|(\d{1,2})\s+o'?clock))(?=\s|$|[.,!?])/;

const MINUTE_MS = 60_000;
const HOUR_MS = 60 * MINUTE_MS;
const DAY_MS = 24 * HOUR_MS;

export type Meridiem = '' | 'am' | 'pm';

/**
 * The instant of a wall-clock time said today or yesterday, in a zone `offsetMinutes` east of
 * UTC: 12 am is midnight, 12 pm noon. Null for a time no clock shows (25:00, 8:60, 13:00 pm).
 */
export function clockInstant(
	now: Date,
	offsetMinutes: number,
	t: { yesterday: boolean; hour: number; minute: number; meridiem: Meridiem }
): number | null {
	let hour = t.hour;
	if (!Number.isInteger(hour) || !Number.isInteger(t.minute) || t.minute > 59) return null;
	if (t.meridiem) {
		if (hour > 12) return null;
		hour = (hour % 12) + (t.meridiem === 'pm' ? 12 : 0);
	} else if (hour > 23) return null;
	const local = new Date(now.getTime() + offsetMinutes * MINUTE_MS);
	const day = Date.UTC(
		local.getUTCFullYear(),
		local.getUTCMonth(),
		local.getUTCDate() - (t.yesterday ? 1 : 0)
	);
	return day + hour * HOUR_MS + t.minute * MINUTE_MS - offsetMinutes * MINUTE_MS;
}

export interface TimeClause {
	/** The phrase with the time clause cut out. */
	rest: string;
	occurredAt: string | null;
	problems: string[];
}

const dtfCache = new Map<string, Intl.DateTimeFormat>();
/** The last answer per zone, by whole second: the offset depends on nothing finer. */
const lastOffset = new Map<string, { second: number; offset: number }>();

/** Minutes east of UTC for `timeZone` at `instant`; throws RangeError for an unknown zone. */
export function zoneOffsetMinutes(instant: Date, timeZone: string): number {
	const second = Math.floor(instant.getTime() / 1000);
	const last = lastOffset.get(timeZone);
	if (last && last.second === second) return last.offset;
	let dtf = dtfCache.get(timeZone);
	if (!dtf) {
		dtf = new Intl.DateTimeFormat('en-US', {
			timeZone,
			hourCycle: 'h23',
			year: 'numeric',
			month: 'numeric',
			day: 'numeric',
			hour: 'numeric',
			minute: 'numeric',
			second: 'numeric'
		});
		if (dtfCache.size > 50) {
			dtfCache.clear();
			lastOffset.clear();
		}
		dtfCache.set(timeZone, dtf);
	}
	const p: Record<string, number> = {};
	for (const part of dtf.formatToParts(instant)) {
		if (part.type !== 'literal') p[part.type] = Number(part.value);
	}
	const asUtc = Date.UTC(
		p.year ?? 1970,
		(p.month ?? 1) - 1,
		p.day ?? 1,
		(p.hour ?? 0) % 24,
		p.minute ?? 0,
		p.second ?? 0
	);
	const offset = Math.round((asUtc - second * 1000) / 60000);
	lastOffset.set(timeZone, { second, offset });
	return offset;
}

let zone: string | undefined;

/**
 * The runtime's time zone, read once: making an Intl.DateTimeFormat to ask costs about half a
 * millisecond, on every phrase (each keystroke in the call bar, each append on the server).
 */
export function defaultTimeZone(): string {
	if (zone) return zone;
	try {
		zone = Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';
	} catch {
		zone = 'UTC';
	}
	return zone;
}

function cut(text: string, index: number, clause: string): string {
	return (text.slice(0, index) + ' ' + text.slice(index + clause.length)).trim();
}

/** Finds and resolves a time clause in normalised (lower-case) phrase text. */
export function extractTime(text: string, now: Date, timeZone: string): TimeClause {
	const problems: string[] = [];
	const ago = AGO_RE.exec(text);
	const clock = ago ? null : CLOCK_RE.exec(text);
	const m = ago ?? clock;
	if (!m || m[1] === undefined) return { rest: text, occurredAt: null, problems };
	const clause = m[1];
	const start = m.index + m[0].length - clause.length;
	const rest = cut(text, start, clause);

	let offset = 0;
	try {
		offset = zoneOffsetMinutes(now, timeZone);
	} catch {
		problems.push(`Unknown time zone '${timeZone}'; the time was read as UTC.`);
	}

	let when: number | null;
	if (ago) {
		const amount = (ago[2] ?? '').trim();
		const unit = ago[3] ?? 'minutes';
		const n = /^half an?$/.test(amount)
			? 30
			: /^\d+$/.test(amount)
				? Number(amount)
				: /^an?$/.test(amount)
					? 1
					: amount === 'a couple of'
						? 2
						: amount === 'a few'
							? 3
							: wordsToNumber(amount);
		if (n === null) return { rest, occurredAt: null, problems };
		// "half an hour" is thirty minutes, whatever unit word follows it
		const unitMs = /^half an?$/.test(amount)
			? MINUTE_MS
			: unit.startsWith('h')
				? HOUR_MS
				: unit.startsWith('s')
					? 1000
					: MINUTE_MS;
		when = now.getTime() - n * unitMs;
	} else {
		when = clockInstant(now, offset, {
			yesterday: clock?.[2] === 'yesterday',
			hour: Number(clock?.[3] ?? clock?.[6] ?? clock?.[8]),
			minute: Number(clock?.[4] ?? '00'),
			meridiem: (clock?.[5] ?? clock?.[7] ?? '').replace(/\./g, '') as Meridiem
		});
	}
	if (when === null) {
		problems.push(`Could not read the time '${clause}'.`);
		return { rest, occurredAt: null, problems };
	}
	const explicitDay = !ago && clock?.[2] !== undefined;
	// A clock time later than now means the same time yesterday ("at 23:50" said after midnight),
	// unless it is only a little ahead, which is a clock difference, not a back-date.
	if (!ago && when > now.getTime() + MINUTE_MS) {
		if (!explicitDay && when - now.getTime() > HOUR_MS) {
			when -= DAY_MS;
		} else {
			problems.push(`${clause} is later than now; the entry keeps the current time.`);
			return { rest, occurredAt: null, problems };
		}
	}
	return { rest, occurredAt: new Date(when).toISOString(), problems };
}
