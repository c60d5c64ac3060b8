// A step's spec as entered (nominal with min/max, or nominal ± tolerance) and as stored
// (nominal, min, max). Pure: shared by the procedure editor, the imports and their tests.

import { formatNumber, unitSymbol } from '../units/format';

export interface SpecInput {
	nominal?: number | null;
	min?: number | null;
	max?: number | null;
	/** Symmetric tolerance: nominal ± this. */
	plusMinus?: number | null;
}

export interface StoredSpec {
	nominal: number | null;
	min: number | null;
	max: number | null;
}

export type SpecResult =
	| ({ ok: true } & StoredSpec)
	| { ok: false; field: 'nominal' | 'min' | 'max' | 'plusMinus'; message: string };

const given = (v: number | null | undefined): v is number => typeof v === 'number';

/** Rounds away binary noise from nominal ± tolerance (24 − 2.2 must be 21.8, not 21.799…). */
function clean(v: number): number {
	return Number.parseFloat(v.toPrecision(12));
}

/**
 * Turns what was entered into what is stored. A ± tolerance becomes min/max around the
 * nominal; min/max and ± together are refused (which one is meant?). A nominal alone stays
 * nominal-only: the shop's default tolerance is applied when a value is judged, so changing
 * the shop setting later still applies to it.
 */
export function toStoredSpec(input: SpecInput): SpecResult {
	const { nominal, min, max, plusMinus } = input;
	for (const [field, v] of [
		['nominal', nominal],
		['min', min],
		['max', max],
		['plusMinus', plusMinus]
	] as const) {
		if (given(v) && !Number.isFinite(v)) {
			return { ok: false, field, message: 'Enter a number.' };
		}
	}
	if (given(plusMinus)) {
		if (given(min) || given(max)) {
			return {
				ok: false,
				field: 'plusMinus',
				message: 'Give either min and max or a ± tolerance, not both.'
			};
		}
		if (!given(nominal)) {
			return { ok: false, field: 'nominal', message: 'A ± tolerance needs a nominal value.' };
		}
		if (plusMinus <= 0) {
			return { ok: false, field: 'plusMinus', message: 'The tolerance must be more than 0.' };
		}
		return {
			ok: true,
			nominal,
			min: clean(nominal - plusMinus),
			max: clean(nominal + plusMinus)
		};
	}
	if (given(min) && given(max) && min > max) {
		return { ok: false, field: 'max', message: 'Max must not be less than min.' };
	}
	if (given(nominal) && given(min) && nominal < min) {
		return { ok: false, field: 'nominal', message: 'The nominal value is below min.' };
	}
	if (given(nominal) && given(max) && nominal > max) {
		return { ok: false, field: 'nominal', message: 'The nominal value is above max.' };
	}
	return { ok: true, nominal: nominal ?? null, min: min ?? null, max: max ?? null };
}

/** The symmetric tolerance of a stored spec, when it has one (for the editor's ± field). */
export function plusMinusOf(spec: StoredSpec): number | null {
	if (spec.nominal === null || spec.min === null || spec.max === null) return null;
	const below = clean(spec.nominal - spec.min);
	const above = clean(spec.max - spec.nominal);
	return below === above && below > 0 ? below : null;
}

/** A spec for screens: "22–26 N·m (nominal 24)", "1.1 L", "≥ 20 mm", "—" for a check. */
export function describeSpec(
	spec: StoredSpec & { unit: string | null },
	fmt: (n: number) => string,
	symbol: (code: string) => string
): string {
	const u = spec.unit ? ` ${symbol(spec.unit)}` : '';
	const { nominal, min, max } = spec;
	if (min !== null && max !== null) {
		return `${fmt(min)}–${fmt(max)}${u}${nominal !== null ? ` (nominal ${fmt(nominal)})` : ''}`;
	}
	if (min !== null) return `≥ ${fmt(min)}${u}`;
	if (max !== null) return `≤ ${fmt(max)}${u}`;
	if (nominal !== null) return `${fmt(nominal)}${u}`;
	return '—';
}

/** A spec as the screens show it: the app's number style and the trade's unit symbols. */
export function specLabel(spec: StoredSpec & { unit: string | null }): string {
	return describeSpec(spec, (n) => formatNumber(n), unitSymbol);
}
