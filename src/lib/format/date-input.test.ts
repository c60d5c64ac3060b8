import { describe, expect, it } from 'vitest';
import {
	dateStyleOf,
	formatDateInput,
	formatTimeInput,
	instantOf,
	parseDateInput,
	parseTimeInput
} from './date-input';

const LOCALES = ['en-GB', 'en-US', 'de-DE', 'fr-FR'];

// The reference: Intl's own short numeric date in the Gregorian calendar (ECMA-402, CLDR data).
const intl = (locale: string, iso: string) =>
	new Intl.DateTimeFormat(locale, {
		year: 'numeric',
		month: 'numeric',
		day: 'numeric',
		timeZone: 'UTC'
	}).format(new Date(`${iso}T00:00:00Z`));

describe('dates typed in the shop’s style', () => {
	it('shows a day as Intl writes it for the locale', () => {
		// CLDR's patterns as Node's ICU ships them: dd/MM/y, M/d/y, d.M.y, dd/MM/y
		expect(formatDateInput('2026-12-04', 'en-GB')).toBe('04/12/2026');
		expect(formatDateInput('2026-12-04', 'en-US')).toBe('12/4/2026');
		expect(formatDateInput('2026-12-04', 'de-DE')).toBe('4.12.2026');
		expect(formatDateInput('2026-12-04', 'fr-FR')).toBe('04/12/2026');
		expect(dateStyleOf('en-US')).toMatchObject({
			order: ['month', 'day', 'year'],
			pattern: 'mm/dd/yyyy'
		});
		expect(dateStyleOf('de-DE')).toMatchObject({
			order: ['day', 'month', 'year'],
			pattern: 'dd.mm.yyyy'
		});
	});

	it('reads back every day of two years in four locales, equal to Intl’s text', () => {
		for (const locale of LOCALES) {
			for (let t = Date.UTC(2026, 0, 1); t < Date.UTC(2028, 0, 1); t += 86_400_000) {
				const iso = new Date(t).toISOString().slice(0, 10);
				const shown = formatDateInput(iso, locale);
				expect(shown).toBe(intl(locale, iso));
				expect(parseDateInput(shown, locale)).toEqual({ ok: true, iso });
			}
		}
	});

	it('takes the locale’s order with any separator, a two-digit year, or ISO', () => {
		expect(parseDateInput('4/12/2026', 'en-GB')).toEqual({ ok: true, iso: '2026-12-04' });
		expect(parseDateInput('12/4/2026', 'en-US')).toEqual({ ok: true, iso: '2026-12-04' });
		expect(parseDateInput('4.12.26', 'de-DE')).toEqual({ ok: true, iso: '2026-12-04' });
		expect(parseDateInput('04 12 2026', 'fr-FR')).toEqual({ ok: true, iso: '2026-12-04' });
		expect(parseDateInput('2026-12-04', 'en-US')).toEqual({ ok: true, iso: '2026-12-04' });
		expect(parseDateInput('  ', 'en-GB')).toEqual({ ok: true, iso: '' });
		// digits only, from a phone's number pad
		expect(parseDateInput('04122026', 'en-GB')).toEqual({ ok: true, iso: '2026-12-04' });
		expect(parseDateInput('120426', 'en-US')).toEqual({ ok: true, iso: '2026-12-04' });
	});

	it('says what is wrong with a day that is not one, in the shop’s pattern', () => {
		expect(parseDateInput('31/02/2026', 'en-GB')).toEqual({
			ok: false,
			message: '“31/02/2026” is not a day of the calendar: write it as dd/mm/yyyy, e.g. 04/12/2026.'
		});
		// 13/4/2026 is 13 April in en-GB but no month 13 in en-US
		expect(parseDateInput('13/4/2026', 'en-GB')).toEqual({ ok: true, iso: '2026-04-13' });
		const us = parseDateInput('13/4/2026', 'en-US');
		expect(us.ok).toBe(false);
		if (!us.ok) expect(us.message).toContain('mm/dd/yyyy, e.g. 12/4/2026');
		for (const wild of ['tomorrow', '4/12', '1/2/3/4', '4/12/20266', '0.0.2026']) {
			expect(parseDateInput(wild, 'de-DE').ok, wild).toBe(false);
		}
	});
});

describe('times typed in the shop’s style', () => {
	it('shows a time as Intl writes it: 24-hour in en-GB and de-DE, AM/PM in en-US', () => {
		expect(formatTimeInput(14 * 60 + 5, 'en-GB')).toBe('14:05');
		expect(formatTimeInput(14 * 60 + 5, 'de-DE')).toBe('14:05');
		expect(formatTimeInput(14 * 60 + 5, 'en-US')).toBe('2:05 PM');
		for (const locale of LOCALES) {
			for (let m = 0; m < 1440; m += 7) {
				expect(parseTimeInput(formatTimeInput(m, locale), locale)).toEqual({
					ok: true,
					minutes: m
				});
			}
		}
	});

	it('takes the usual ways of writing a time and refuses the rest', () => {
		expect(parseTimeInput('9', 'en-GB')).toEqual({ ok: true, minutes: 540 });
		expect(parseTimeInput('14.30', 'de-DE')).toEqual({ ok: true, minutes: 870 });
		expect(parseTimeInput('1430', 'en-GB')).toEqual({ ok: true, minutes: 870 });
		expect(parseTimeInput('12:15 am', 'en-US')).toEqual({ ok: true, minutes: 15 });
		expect(parseTimeInput('12 PM', 'en-US')).toEqual({ ok: true, minutes: 720 });
		for (const wild of ['25:00', '13 pm', '10:75', 'noon', '']) {
			expect(parseTimeInput(wild, 'en-GB').ok, wild).toBe(false);
		}
	});

	it('turns a day and time on the shop’s clock into the instant the server stores', () => {
		// New York is UTC−5 in December, Berlin UTC+1 (IANA tz database).
		expect(instantOf('2026-12-04', 10 * 60 + 30, 'America/New_York')).toBe(
			'2026-12-04T15:30:00.000Z'
		);
		expect(instantOf('2026-12-04', 0, 'Europe/Berlin')).toBe('2026-12-03T23:00:00.000Z');
		expect(instantOf('2026-02-30', 0, 'UTC')).toBeNull();
	});
});
