import { describe, expect, it } from 'vitest';
import {
	formatMoney,
	isKnownCurrency,
	lineAmountMinor,
	MINOR_UNIT_EXPONENTS,
	minorExponent,
	parseMoney,
	priceLine,
	sumTotals,
	taxMinor,
	toDecimalString
} from './index';

describe('ISO 4217 minor-unit exponents', () => {
	// ISO 4217 list one, "Minor unit" column: EUR 2, JPY 0, BHD 3, KWD 3, ISK 0.
	it('knows two, zero and three decimal places', () => {
		expect(minorExponent('EUR')).toBe(2);
		expect(minorExponent('JPY')).toBe(0);
		expect(minorExponent('BHD')).toBe(3);
		expect(minorExponent('KWD')).toBe(3);
		expect(minorExponent('ISK')).toBe(0);
		expect(minorExponent('eur')).toBe(2);
	});
	it('refuses a code it does not know instead of guessing', () => {
		expect(() => minorExponent('XYZ')).toThrow(/Unknown currency "XYZ"/);
		expect(() => minorExponent('constructor')).toThrow(/Unknown currency/);
	});
	it('takes the whole of ISO 4217 list one, with its minor units', () => {
		// ISO 4217 list one (2024-06-25), "Minor unit" column: TWD 2, PKR 2, COP 2, BDT 2,
		// NGN 2, ARS 2, EGP 2, KES 2, UYU 2, XPF 0, RWF 0, DJF 0, IQD 3, LYD 3, CLP 0.
		const expected: Record<string, number> = {
			TWD: 2,
			PKR: 2,
			COP: 2,
			BDT: 2,
			NGN: 2,
			ARS: 2,
			EGP: 2,
			KES: 2,
			UYU: 2,
			XPF: 0,
			RWF: 0,
			DJF: 0,
			IQD: 3,
			LYD: 3,
			CLP: 0
		};
		for (const [code, digits] of Object.entries(expected)) {
			expect(minorExponent(code), code).toBe(digits);
		}
		// List one holds about 155 active currencies once metals, funds and test codes are out.
		expect(Object.keys(MINOR_UNIT_EXPONENTS).length).toBeGreaterThan(150);
	});
	it('refuses codes one cannot invoice in (metals, funds, the test code)', () => {
		// ISO 4217 list one: XAU gold and XTS testing have minor unit "N.A."; CLF is a fund.
		for (const c of ['XAU', 'XTS', 'XXX', 'CLF']) expect(isKnownCurrency(c), c).toBe(false);
	});
	it('agrees with the ICU currency data that Intl.NumberFormat carries for common codes', () => {
		// A second outside source: CLDR's currency digits, which ICU ships with Node.
		for (const c of ['EUR', 'USD', 'GBP', 'JPY', 'BHD', 'KWD', 'KRW']) {
			const digits = new Intl.NumberFormat('en', {
				style: 'currency',
				currency: c
			}).resolvedOptions().maximumFractionDigits;
			expect(minorExponent(c), c).toBe(digits);
		}
	});
});

describe('line rounding (per line, halves away from zero)', () => {
	it('prices 1.041 L of oil at 14.90 a litre', () => {
		// By hand: 1.041 × 1490 = 1551.09 cents → 1551 cents (15.51).
		expect(lineAmountMinor(1.041, 1490)).toBe(1551);
	});
	it('rounds an exact half up, and a negative half down (away from zero)', () => {
		// By hand: 0.5 × 3 = 1.5 → 2; −0.5 × 3 = −1.5 → −2; 2.5 × 1 = 2.5 → 3 (not to even).
		expect(lineAmountMinor(0.5, 3)).toBe(2);
		expect(lineAmountMinor(-0.5, 3)).toBe(-2);
		expect(lineAmountMinor(2.5, 1)).toBe(3);
	});
	it('does not fall below a half because of binary floating point', () => {
		// 1.005 × 100 is 100.49999999999999 in doubles; exactly it is 100.5 → 101.
		expect(1.005 * 100).toBeLessThan(100.5);
		expect(lineAmountMinor(1.005, 100)).toBe(101);
	});
	it('prices labour hours', () => {
		// By hand: 1.5 h × 72.00 = 108.00 → 10800 cents; 0.75 h × 72.00 = 54.00.
		expect(lineAmountMinor(1.5, 7200)).toBe(10800);
		expect(lineAmountMinor(0.75, 7200)).toBe(5400);
	});
	it('refuses a unit price that is not whole minor units', () => {
		expect(() => lineAmountMinor(1, 1.5)).toThrow(/whole minor units/);
	});
});

describe('tax from the shop rate in basis points', () => {
	it('takes 20 % of a line and rounds once per line', () => {
		// By hand: 1551 × 0.20 = 310.2 → 310; 1555 × 0.20 = 311.0; 1553 × 0.075 = 116.475 → 116.
		expect(taxMinor(1551, 2000)).toBe(310);
		expect(taxMinor(1555, 2000)).toBe(311);
		expect(taxMinor(1553, 750)).toBe(116);
	});
	it('rounds a tax half away from zero, also on a discount', () => {
		// By hand: 25 × 0.10 = 2.5 → 3; −25 × 0.10 = −2.5 → −3.
		expect(taxMinor(25, 1000)).toBe(3);
		expect(taxMinor(-25, 1000)).toBe(-3);
	});
});

describe('a worked invoice: per line, then totals', () => {
	it('adds the rounded lines and their rounded taxes', () => {
		// Lines, at 20 % (2000 bp), computed by hand:
		//   oil 1.041 L × 14.90  = 15.5109 → 15.51, tax 3.102  → 3.10
		//   washer 1 × 1.20      =  1.20,           tax 0.24
		//   filter 1 × 8.90      =  8.90,           tax 1.78
		//   labour 1.5 h × 72.00 = 108.00,          tax 21.60
		//   discount −5.00       =  −5.00,          tax −1.00
		// Subtotal 128.61; tax 3.10 + 0.24 + 1.78 + 21.60 − 1.00 = 25.72; total 154.33.
		// (Tax on the subtotal instead would be 128.61 × 0.2 = 25.722 → 25.72: the same here, by
		// chance; the rule is the per-line one.)
		const lines = [
			{ quantity: 1.041, unitPriceMinor: 1490, taxRateBp: 2000 },
			{ quantity: 1, unitPriceMinor: 120, taxRateBp: 2000 },
			{ quantity: 1, unitPriceMinor: 890, taxRateBp: 2000 },
			{ quantity: 1.5, unitPriceMinor: 7200, taxRateBp: 2000 },
			{ quantity: 1, unitPriceMinor: -500, taxRateBp: 2000 }
		].map(priceLine);
		expect(lines.map((l) => l.amountMinor)).toEqual([1551, 120, 890, 10800, -500]);
		expect(lines.map((l) => l.taxMinor)).toEqual([310, 24, 178, 2160, -100]);
		expect(sumTotals(lines)).toEqual({ subtotalMinor: 12861, taxMinor: 2572, totalMinor: 15433 });
	});
	it('shows where per-line rounding differs from tax on the total', () => {
		// Three lines of 0.05 at 10 %: each tax 0.005 → 0.01 (half away), so 0.03 in all;
		// tax on the 0.15 total would be 0.015 → 0.02. The per-line rule gives 0.03.
		const lines = [5, 5, 5].map((p) =>
			priceLine({ quantity: 1, unitPriceMinor: p, taxRateBp: 1000 })
		);
		expect(sumTotals(lines)).toEqual({ subtotalMinor: 15, taxMinor: 3, totalMinor: 18 });
	});
	it('works in a currency without a minor unit', () => {
		// JPY: 1.041 L × ¥1,800 = 1873.8 → ¥1,874; tax 10 % = 187.4 → ¥187; total ¥2,061.
		const l = priceLine({ quantity: 1.041, unitPriceMinor: 1800, taxRateBp: 1000 });
		expect(l).toEqual({ amountMinor: 1874, taxMinor: 187 });
		expect(formatMoney(sumTotals([l]).totalMinor, 'JPY', 'en-GB')).toBe('JP¥2,061');
	});
});

describe('reading and writing amounts', () => {
	it('writes minor units in major units with the currency exponent', () => {
		expect(toDecimalString(1551, 'EUR')).toBe('15.51');
		expect(toDecimalString(5, 'EUR')).toBe('0.05');
		expect(toDecimalString(-500, 'EUR')).toBe('-5.00');
		expect(toDecimalString(2061, 'JPY')).toBe('2061');
		expect(toDecimalString(12345, 'BHD')).toBe('12.345');
	});
	it('reads typed amounts and refuses extra decimals', () => {
		expect(parseMoney('12.50', 'EUR')).toEqual({ ok: true, minor: 1250 });
		expect(parseMoney('12,5', 'EUR')).toEqual({ ok: true, minor: 1250 });
		expect(parseMoney('1 200', 'JPY')).toEqual({ ok: true, minor: 1200 });
		expect(parseMoney('1.250', 'BHD')).toEqual({ ok: true, minor: 1250 });
		expect(parseMoney('12.505', 'EUR').ok).toBe(false);
		expect(parseMoney('12.5', 'JPY')).toEqual({
			ok: false,
			error: 'JPY has no minor unit: type a whole amount'
		});
		expect(parseMoney('twelve', 'EUR').ok).toBe(false);
	});
	it('formats with Intl.NumberFormat and the currency digits', () => {
		expect(formatMoney(15433, 'EUR', 'en-GB')).toBe('€154.33');
		expect(formatMoney(15433, 'EUR', 'de-DE')).toBe('154,33\u00a0€');
		expect(formatMoney(12345, 'BHD', 'en-GB')).toBe('BHD\u00a012.345');
		expect(formatMoney(-500, 'EUR', 'en-GB')).toBe('-€5.00');
	});
});
