// Money in integer minor units. Pure: no framework, database or Svelte imports.
//
// The rounding rule, written down once:
//   1. Each line is rounded on its own: amount = quantity × unit price, rounded to a whole minor
//      unit; the line's tax = amount × rate, rounded to a whole minor unit.
//   2. Totals are plain sums of the rounded lines: subtotal = Σ amounts, tax = Σ line taxes,
//      total = subtotal + tax. Nothing is rounded twice.
//   3. "Rounded" means to the nearest whole minor unit, halves away from zero
//      (0.5 → 1, −0.5 → −1, 2.5 → 3): commercial rounding, common practice on invoices, and the
//      same for a discount (negative) line as for a charge.
// Quantities are taken to 6 decimal places and the arithmetic is done in bigint, so a float
// like 1.041 × 1490 never lands on the wrong side of a half.

import { data as iso4217, publishDate as iso4217Published } from 'currency-codes';

/**
 * Codes of ISO 4217 list one that a shop cannot invoice in: the precious metals, bond units,
 * SDR, the testing and "no currency" codes (their "Minor unit" column reads N.A.), and the
 * fund codes (IsFund="true"). Source: ISO 4217 list one as published on 2024-06-25 (shipped as
 * node_modules/currency-codes/iso-4217-list-one.xml).
 */
const NOT_FOR_INVOICES = new Set([
	'XAG',
	'XAU',
	'XBA',
	'XBB',
	'XBC',
	'XBD',
	'XDR',
	'XPD',
	'XPT',
	'XSU',
	'XTS',
	'XUA',
	'XXX',
	'BOV',
	'CHE',
	'CHW',
	'CLF',
	'COU',
	'MXV',
	'USN',
	'UYI',
	'UYW'
]);

/**
 * ISO 4217 minor-unit exponents (digits after the decimal point) for every currency of list
 * one. Source: ISO 4217 "List one: currency, fund and precious metal codes", the "Minor unit"
 * column, through the npm package `currency-codes` (its data is generated from the maintenance
 * agency's XML; {@link ISO_4217_PUBLISHED} says which edition). An unknown code is refused,
 * never guessed.
 */
export const MINOR_UNIT_EXPONENTS: Readonly<Record<string, number>> = Object.freeze(
	Object.fromEntries(
		iso4217.filter((c) => !NOT_FOR_INVOICES.has(c.code)).map((c) => [c.code, c.digits])
	)
);

/** The edition of ISO 4217 list one the exponents come from. */
export const ISO_4217_PUBLISHED: string = iso4217Published;

/** The minor-unit exponent of an ISO 4217 code; throws a clear error for an unknown code. */
export function minorExponent(currency: string): number {
	const e = Object.hasOwn(MINOR_UNIT_EXPONENTS, currency.toUpperCase())
		? MINOR_UNIT_EXPONENTS[currency.toUpperCase()]
		: undefined;
	if (e === undefined) {
		throw new Error(`Unknown currency "${currency}": use an ISO 4217 code such as EUR or JPY`);
	}
	return e;
}

export function isKnownCurrency(currency: string): boolean {
	return Object.hasOwn(MINOR_UNIT_EXPONENTS, currency.toUpperCase());
}

/**
 * The largest amount Benchcall keeps, in minor units: amounts are stored in PostgreSQL
 * `integer` columns (2^31 − 1). 21 474 836.47 EUR, 2 147 483 647 JPY: far above any workshop
 * invoice, and every sum of an invoice is checked against it before it is stored.
 */
export const MAX_AMOUNT_MINOR = 2_147_483_647;

/** Whether a minor-unit amount fits the columns it is stored in (either sign). */
export function fitsAmount(minor: number): boolean {
	return Number.isSafeInteger(minor) && Math.abs(minor) <= MAX_AMOUNT_MINOR;
}

/** Rounds a bigint fraction n/d to the nearest integer, halves away from zero. */
function roundFraction(n: bigint, d: bigint): bigint {
	if (d < 0n) {
		n = -n;
		d = -d;
	}
	const neg = n < 0n;
	const a = neg ? -n : n;
	const q = a / d;
	const r = a % d;
	const up = r * 2n >= d ? q + 1n : q;
	return neg ? -up : up;
}

const QTY_SCALE = 1_000_000n;

/** A quantity as an exact count of millionths (1.041 → 1 041 000). */
function quantityMicros(quantity: number): bigint {
	if (!Number.isFinite(quantity)) throw new Error('The quantity must be a finite number');
	// toFixed(6) reads the double's decimal form, so 1.041 is 1.041000, not 1.0409999…
	const [whole, frac = ''] = Math.abs(quantity).toFixed(6).split('.');
	const micros = BigInt(whole) * QTY_SCALE + BigInt(frac.padEnd(6, '0'));
	return quantity < 0 ? -micros : micros;
}

function toSafeNumber(v: bigint): number {
	if (v > BigInt(Number.MAX_SAFE_INTEGER) || v < BigInt(Number.MIN_SAFE_INTEGER)) {
		throw new Error('The amount is too large');
	}
	return Number(v);
}

/** quantity × unit price, rounded to a whole minor unit, halves away from zero. */
export function lineAmountMinor(quantity: number, unitPriceMinor: number): number {
	if (!Number.isInteger(unitPriceMinor))
		throw new Error('The unit price must be whole minor units');
	return toSafeNumber(roundFraction(quantityMicros(quantity) * BigInt(unitPriceMinor), QTY_SCALE));
}

/** Tax on a rounded amount at a rate in basis points (20 % = 2000), halves away from zero. */
export function taxMinor(amountMinor: number, rateBp: number): number {
	if (!Number.isInteger(amountMinor)) throw new Error('The amount must be whole minor units');
	if (!Number.isInteger(rateBp) || rateBp < 0)
		throw new Error('The tax rate must be whole basis points');
	return toSafeNumber(roundFraction(BigInt(amountMinor) * BigInt(rateBp), 10_000n));
}

export interface PricedLine {
	quantity: number;
	unitPriceMinor: number;
	taxRateBp: number;
}

export interface RoundedLine {
	amountMinor: number;
	taxMinor: number;
}

/** Rule 1: one line, rounded on its own. */
export function priceLine(line: PricedLine): RoundedLine {
	const amountMinor = lineAmountMinor(line.quantity, line.unitPriceMinor);
	return { amountMinor, taxMinor: taxMinor(amountMinor, line.taxRateBp) };
}

export interface Totals {
	subtotalMinor: number;
	taxMinor: number;
	totalMinor: number;
}

/** Rule 2: totals are sums of the rounded lines. */
export function sumTotals(lines: readonly RoundedLine[]): Totals {
	let subtotal = 0;
	let tax = 0;
	for (const l of lines) {
		subtotal += l.amountMinor;
		tax += l.taxMinor;
	}
	return { subtotalMinor: subtotal, taxMinor: tax, totalMinor: subtotal + tax };
}

/** A minor-unit amount as a plain decimal string in major units: 1551 EUR → "15.51". */
export function toDecimalString(minor: number, currency: string): string {
	const e = minorExponent(currency);
	const neg = minor < 0;
	const digits = String(Math.abs(minor)).padStart(e + 1, '0');
	const whole = e === 0 ? digits : digits.slice(0, -e);
	const frac = e === 0 ? '' : '.' + digits.slice(-e);
	return (neg ? '-' : '') + whole + frac;
}

/**
 * Reads an amount typed in major units ("12.50", "12,5", "1 200") into minor units. Refuses more
 * decimals than the currency has (JPY takes none), so nothing is silently rounded.
 */
export function parseMoney(
	text: string,
	currency: string
): { ok: true; minor: number } | { ok: false; error: string } {
	const e = minorExponent(currency);
	const cleaned = text
		.trim()
		.replace(/[\s\u00a0']/g, '')
		.replace(',', '.');
	const m = /^(-?)(\d+)(?:\.(\d*))?$/.exec(cleaned);
	if (!m) return { ok: false, error: 'Type an amount such as 12.50' };
	const frac = m[3] ?? '';
	if (frac.length > e) {
		return {
			ok: false,
			error:
				e === 0
					? `${currency} has no minor unit: type a whole amount`
					: `${currency} has ${e} decimal places at most`
		};
	}
	const minor = BigInt(m[2]) * 10n ** BigInt(e) + BigInt(frac.padEnd(e, '0') || '0');
	const signed = m[1] === '-' ? -minor : minor;
	if (minor > BigInt(MAX_AMOUNT_MINOR)) {
		return {
			ok: false,
			error: `The amount is too large: at most ${toDecimalString(MAX_AMOUNT_MINOR, currency)}`
		};
	}
	return { ok: true, minor: Number(signed) };
}

/** Formats minor units for a person, with the currency's own number of decimals. */
export function formatMoney(minor: number, currency: string, locale = 'en-GB'): string {
	const e = minorExponent(currency);
	return new Intl.NumberFormat(locale, {
		style: 'currency',
		currency,
		minimumFractionDigits: e,
		maximumFractionDigits: e
	}).format(Number(toDecimalString(minor, currency)));
}
