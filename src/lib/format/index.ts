// One date and number style per shop. Every date, time and number shown on screen, in PDFs and
// in CSVs goes through a ShopFormat made from the shop's locale and time zone (Intl), so a
// device's own settings never mix "12/3/2026" with "3 Dec" on one screen.

export interface ShopStyle {
	/** BCP 47 language tag, e.g. "en-GB". */
	locale: string;
	/** IANA time zone, e.g. "Europe/London". */
	timeZone: string;
}

export const defaultStyle: ShopStyle = { locale: 'en-GB', timeZone: 'UTC' };

/** A canonical BCP 47 tag Intl knows, or null. */
export function canonicalLocale(tag: string): string | null {
	try {
		const [c] = Intl.getCanonicalLocales(tag.trim());
		if (!c) return null;
		return Intl.DateTimeFormat.supportedLocalesOf([c]).length ? c : null;
	} catch {
		return null;
	}
}

/** The IANA zone name Intl resolves `zone` to, or null for an unknown zone. */
export function canonicalTimeZone(zone: string): string | null {
	try {
		return new Intl.DateTimeFormat('en', { timeZone: zone.trim() }).resolvedOptions().timeZone;
	} catch {
		return null;
	}
}

type When = Date | string | number;
const toDate = (d: When) => (d instanceof Date ? d : new Date(d));

export interface ShopFormat extends ShopStyle {
	/** "09:05" — a 24-hour clock where the locale uses one. */
	time(d: When): string;
	/** "3 Dec" */
	dayMonth(d: When): string;
	/** "3 Dec 2026" */
	date(d: When): string;
	/** "03/12/2026" — for tables and CSVs */
	dateShort(d: When): string;
	/** "3 Dec 2026, 09:05" */
	dateTime(d: When): string;
	/** "03/12/2026, 09:05" */
	dateTimeShort(d: When): string;
	/** the calendar day in the shop's zone as YYYY-MM-DD (date inputs, day grouping) */
	isoDay(d: When): string;
	/** "3 Dec 2026" for a calendar day given as YYYY-MM-DD: a date without a time never shifts */
	calendarDay(ymd: string): string;
	/** a number in the shop's style, with at most `maxDigits` decimals */
	number(n: number, maxDigits?: number): string;
}

/** The shop's formatters. Unknown locale or zone falls back to the defaults, never throws. */
export function shopFormat(style: Partial<ShopStyle> = {}): ShopFormat {
	const locale = canonicalLocale(style.locale ?? '') ?? defaultStyle.locale;
	const timeZone = canonicalTimeZone(style.timeZone ?? '') ?? defaultStyle.timeZone;
	const dtf = (o: Intl.DateTimeFormatOptions) =>
		new Intl.DateTimeFormat(locale, { timeZone, ...o });
	const time = dtf({ hour: '2-digit', minute: '2-digit' });
	const dayMonth = dtf({ day: 'numeric', month: 'short' });
	const date = dtf({ dateStyle: 'medium' });
	const dateShort = dtf({ dateStyle: 'short' });
	const dateTime = dtf({ dateStyle: 'medium', timeStyle: 'short' });
	const dateTimeShort = dtf({ dateStyle: 'short', timeStyle: 'short' });
	const iso = new Intl.DateTimeFormat('en-CA', {
		timeZone,
		year: 'numeric',
		month: '2-digit',
		day: '2-digit'
	});
	const calendar = new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeZone: 'UTC' });
	const numbers = new Map<number, Intl.NumberFormat>();
	return {
		locale,
		timeZone,
		time: (d) => time.format(toDate(d)),
		dayMonth: (d) => dayMonth.format(toDate(d)),
		date: (d) => date.format(toDate(d)),
		dateShort: (d) => dateShort.format(toDate(d)),
		dateTime: (d) => dateTime.format(toDate(d)),
		dateTimeShort: (d) => dateTimeShort.format(toDate(d)),
		isoDay: (d) => iso.format(toDate(d)),
		calendarDay: (ymd) =>
			/^\d{4}-\d{2}-\d{2}$/.test(ymd) ? calendar.format(new Date(`${ymd}T00:00:00Z`)) : ymd,
		number(n, maxDigits = 2) {
			let f = numbers.get(maxDigits);
			if (!f) {
				f = new Intl.NumberFormat(locale, { maximumFractionDigits: maxDigits });
				numbers.set(maxDigits, f);
			}
			return f.format(n);
		}
	};
}
