// Dates typed in the shop's style (04/12/2026 in en-GB, 12/4/2026 in en-US, 4.12.2026 in de-DE)
// and read back as ISO days (YYYY-MM-DD), so forms send the server what it always took. The
// order of day, month and year and the separator come from Intl (formatToParts), never from a
// table of our own. Gregorian calendar and Latin digits, so every field can be typed on any
// keyboard. Pure: no framework imports.
import { wallTimeIn } from './day';

export type Part = 'day' | 'month' | 'year';

export interface DateStyle {
	/** the order the locale writes a date in */
	order: Part[];
	/** what goes between the parts ("/", ".", "-") */
	separator: string;
	/** the pattern to show beside the field: "dd/mm/yyyy" */
	pattern: string;
	/** an example in the style: "04/12/2026" */
	example: string;
}

const SAMPLE = Date.UTC(2026, 11, 4);

function dateFormat(locale: string) {
	return new Intl.DateTimeFormat(locale, {
		year: 'numeric',
		month: 'numeric',
		day: 'numeric',
		timeZone: 'UTC',
		calendar: 'gregory',
		numberingSystem: 'latn'
	});
}

const styles = new Map<string, DateStyle>();

/** How the locale writes a date, read from Intl. */
export function dateStyleOf(locale: string): DateStyle {
	let s = styles.get(locale);
	if (s) return s;
	const parts = dateFormat(locale).formatToParts(SAMPLE);
	const order = parts.map((p) => p.type).filter((t): t is Part => /^(day|month|year)$/.test(t));
	const literal = parts.find((p) => p.type === 'literal')?.value ?? '/';
	// "2026. 12. 4." → ". ": the mark without the spaces and bidi marks around it
	const separator = literal.replace(/[\s\u200e\u200f]/g, '') || '/';
	const letters: Record<Part, string> = { day: 'dd', month: 'mm', year: 'yyyy' };
	s = {
		order,
		separator,
		pattern: order.map((p) => letters[p]).join(separator),
		example: formatDateInput('2026-12-04', locale)
	};
	styles.set(locale, s);
	return s;
}

/** An ISO day (YYYY-MM-DD) as the shop writes it; anything else comes back as it was. */
export function formatDateInput(iso: string, locale: string): string {
	if (!/^\d{4}-\d{2}-\d{2}$/.test(iso)) return iso;
	const t = Date.parse(`${iso}T00:00:00Z`);
	if (Number.isNaN(t)) return iso;
	return dateFormat(locale)
		.format(t)
		.replace(/[\u200e\u200f]/g, '');
}

export type DateRead = { ok: true; iso: string } | { ok: false; message: string };

function isoOf(y: number, m: number, d: number): string | null {
	if (m < 1 || m > 12 || d < 1 || d > 31 || y < 1000 || y > 9999) return null;
	const iso = `${String(y).padStart(4, '0')}-${String(m).padStart(2, '0')}-${String(d).padStart(2, '0')}`;
	const t = Date.parse(`${iso}T00:00:00Z`);
	return !Number.isNaN(t) && new Date(t).toISOString().slice(0, 10) === iso ? iso : null;
}

/**
 * A date typed in the shop's order, with any separator ("4/12/2026", "4.12.26", "4 12 2026"),
 * or an ISO day; a two-digit year is this century. Empty text reads as an empty day ('').
 */
export function parseDateInput(text: string, locale: string): DateRead {
	const raw = text.trim();
	if (raw === '') return { ok: true, iso: '' };
	const style = dateStyleOf(locale);
	const bad = {
		ok: false as const,
		message: `“${raw.slice(0, 40)}” is not a date: write it as ${style.pattern}, e.g. ${style.example}.`
	};
	let groups = raw.split(/[^0-9]+/).filter(Boolean);
	if (groups.length === 1 && (raw.length === 8 || raw.length === 6)) {
		// digits only, as a phone's number pad types them: 04122026, 041226
		const widths = style.order.map((p) => (p === 'year' ? raw.length - 4 : 2));
		let at = 0;
		groups = widths.map((w) => raw.slice(at, (at += w)));
	}
	if (groups.length !== 3 || groups.some((g) => g.length > 4)) return bad;
	const n = groups.map(Number);
	let y: number, m: number, d: number;
	if (groups[0].length === 4) {
		// a year first is ISO order whatever the locale (2026-12-04)
		[y, m, d] = n;
	} else {
		const at = (p: Part) => n[style.order.indexOf(p)];
		[y, m, d] = [at('year'), at('month'), at('day')];
		if (groups[style.order.indexOf('year')].length <= 2) y += 2000;
	}
	const iso = isoOf(y, m, d);
	if (!iso) {
		return {
			ok: false,
			message: `“${raw.slice(0, 40)}” is not a day of the calendar: write it as ${style.pattern}, e.g. ${style.example}.`
		};
	}
	return { ok: true, iso };
}

function timeFormat(locale: string) {
	return new Intl.DateTimeFormat(locale, {
		hour: 'numeric',
		minute: '2-digit',
		timeZone: 'UTC',
		numberingSystem: 'latn'
	});
}

/** Minutes after midnight (0–1439) as the shop writes a time: "14:05", "2:05 PM". */
export function formatTimeInput(minutes: number, locale: string): string {
	return timeFormat(locale)
		.format(minutes * 60_000)
		.replace(/\u202f/g, ' ');
}

/** An example time in the shop's style and whether it writes AM/PM. */
export function timeStyleOf(locale: string): { example: string; twelveHour: boolean } {
	const cycle = timeFormat(locale).resolvedOptions().hourCycle;
	return { example: formatTimeInput(14 * 60 + 30, locale), twelveHour: /h1[12]/.test(cycle ?? '') };
}

export type TimeRead = { ok: true; minutes: number } | { ok: false; message: string };

/** A time of day: "14:30", "14.30", "1430", "2:30 pm", "2 PM", "9". */
export function parseTimeInput(text: string, locale: string): TimeRead {
	const raw = text.trim().toLowerCase().replace(/\./g, ':');
	const bad = {
		ok: false as const,
		message: `“${text.trim().slice(0, 20)}” is not a time of day: write it like ${timeStyleOf(locale).example}.`
	};
	const m = /^(\d{1,2})(?::?(\d{2}))?\s*(a:?m:?|p:?m:?)?$/.exec(raw);
	if (!m) return bad;
	let h = Number(m[1]);
	const min = Number(m[2] ?? 0);
	const half = m[3]?.[0];
	if (half) {
		if (h < 1 || h > 12) return bad;
		h = (h % 12) + (half === 'p' ? 12 : 0);
	}
	if (h > 23 || min > 59) return bad;
	return { ok: true, minutes: h * 60 + min };
}

/**
 * The instant of a day and time on the shop's clock, as an ISO string with `Z` (what a
 * `datetime-local` field's server already reads), or null when the day is no day.
 */
export function instantOf(iso: string, minutes: number, timeZone: string): string | null {
	return wallTimeIn(iso, minutes, timeZone)?.toISOString() ?? null;
}
