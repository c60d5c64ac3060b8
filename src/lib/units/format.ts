import { UNIT_DEFS } from './table';

export interface FormatOptions {
	/** Fixed number of decimals; overrides `significant`. */
	decimals?: number;
	/** Significant digits kept for small values (default 4; whole numbers are never cut). */
	significant?: number;
	/** Most decimals ever shown (default 4, enough for 0.0015 in). */
	maxDecimals?: number;
	/** Spoken form for read-back: "80 newton metres" instead of "80 N·m". */
	spoken?: boolean;
}

/** Rounds for display: 83.356525 → '83.36', 1450 → '1450', 0.95 → '0.95', 5.40 → '5.4'. */
export function formatNumber(value: number, opts: FormatOptions = {}): string {
	if (typeof value !== 'number' || !Number.isFinite(value)) return '—';
	const maxDecimals = clampInt(opts.maxDecimals ?? 4, 0, 12);
	let decimals: number;
	if (opts.decimals !== undefined) {
		decimals = clampInt(opts.decimals, 0, 12);
	} else {
		const significant = clampInt(opts.significant ?? 4, 1, 15);
		const magnitude = value === 0 ? 0 : Math.floor(Math.log10(Math.abs(value)));
		decimals = clampInt(significant - 1 - magnitude, 0, maxDecimals);
	}
	let s = value.toFixed(decimals);
	if (opts.decimals === undefined && s.includes('.')) s = s.replace(/\.?0+$/, '');
	if (/^-0(?:\.0*)?$/.test(s)) s = s.slice(1);
	return s;
}

function clampInt(x: number, lo: number, hi: number): number {
	if (!Number.isFinite(x)) return lo;
	return Math.min(hi, Math.max(lo, Math.round(x)));
}

/** The trade's symbol for a UCUM code ('N.m' → 'N·m', '/min' → 'rpm'); unknown codes as given. */
export function unitSymbol(code: string): string {
	return UNIT_DEFS.get(code)?.symbol ?? String(code);
}

/**
 * A quantity for screens ("83.36 N·m", "1.1 L", "36 psi", "90 °C") or, with `spoken`, for
 * read-back ("80 newton metres"). Unknown codes are shown as given; a non-number as '—'.
 */
export function formatQuantity(value: number, unit: string, opts: FormatOptions = {}): string {
	const number = formatNumber(value, opts);
	const def = UNIT_DEFS.get(unit);
	if (opts.spoken) {
		if (!def) return `${number} ${unit}`.trim();
		return `${number} ${Math.abs(value) === 1 ? def.name : def.plural}`;
	}
	return `${number} ${def?.symbol ?? unit}`.trim();
}
