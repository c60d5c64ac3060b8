import { describe, expect, it } from 'vitest';
import { canonicalLocale, canonicalTimeZone, shopFormat } from './index';

// Offsets from the IANA time zone database (tzdb): Europe/Berlin is UTC+1 in winter and UTC+2
// from the last Sunday of March; America/New_York is UTC−5 in winter. Day and month words and
// separators from the Unicode CLDR data that Node's ICU carries.
describe('shopFormat', () => {
	const winter = new Date('2026-12-03T23:30:00Z');

	it('shows the time and the day in the shop’s zone, not the device’s', () => {
		const berlin = shopFormat({ locale: 'en-GB', timeZone: 'Europe/Berlin' });
		expect(berlin.time(winter)).toBe('00:30');
		expect(berlin.dayMonth(winter)).toBe('4 Dec');
		expect(berlin.isoDay(winter)).toBe('2026-12-04');
		const ny = shopFormat({ locale: 'en-GB', timeZone: 'America/New_York' });
		expect(ny.time(winter)).toBe('18:30');
		expect(ny.isoDay(winter)).toBe('2026-12-03');
	});

	it('follows summer time (tzdb: Berlin is UTC+2 on 1 July)', () => {
		expect(shopFormat({ timeZone: 'Europe/Berlin' }).time('2026-07-01T12:00:00Z')).toBe('14:00');
	});

	it('writes dates and numbers in the shop’s locale', () => {
		const gb = shopFormat({ locale: 'en-GB', timeZone: 'UTC' });
		expect(gb.dateShort(winter)).toBe('03/12/2026');
		expect(gb.date(winter)).toBe('3 Dec 2026');
		expect(gb.number(1234.5)).toBe('1,234.5');
		const de = shopFormat({ locale: 'de-DE', timeZone: 'UTC' });
		expect(de.dateShort(winter)).toBe('03.12.26');
		expect(de.number(1234.5)).toBe('1.234,5');
		expect(de.number(52.95591, 2)).toBe('52,96');
		const us = shopFormat({ locale: 'en-US', timeZone: 'UTC' });
		expect(us.dateShort(winter)).toBe('12/3/26');
	});

	it('writes a calendar day as it is, whatever the zone (CLDR medium dates)', () => {
		// a zone west of UTC would show midnight UTC as the day before
		const ny = shopFormat({ locale: 'en-US', timeZone: 'America/New_York' });
		expect(ny.calendarDay('2026-12-03')).toBe('Dec 3, 2026');
		expect(
			shopFormat({ locale: 'de-DE', timeZone: 'Pacific/Auckland' }).calendarDay('2026-12-03')
		).toBe('03.12.2026');
		expect(shopFormat({ locale: 'en-GB' }).calendarDay('2026-12-03')).toBe('3 Dec 2026');
		expect(ny.calendarDay('not a day')).toBe('not a day');
	});

	it('falls back to en-GB and UTC for a locale or zone Intl does not know', () => {
		const f = shopFormat({ locale: 'not a locale!', timeZone: 'Mars/Olympus' });
		expect(f.locale).toBe('en-GB');
		expect(f.timeZone).toBe('UTC');
	});
});

describe('canonical names', () => {
	it('accepts and tidies real names, refuses others', () => {
		expect(canonicalLocale('en-gb')).toBe('en-GB');
		expect(canonicalLocale('xx-!!')).toBeNull();
		expect(canonicalTimeZone('Europe/London')).toBe('Europe/London');
		expect(canonicalTimeZone('Europe/Nowhere')).toBeNull();
	});
});
