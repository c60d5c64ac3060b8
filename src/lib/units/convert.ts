import { add, dec, div, mul, sub, toNumber } from './rational';
import { UNIT_DEFS, type Dimension, type UnitDef, type UnitInfo } from './table';

const CODE_HINTS: Record<string, string> = {
	nm: 'N.m',
	'n·m': 'N.m',
	'n m': 'N.m',
	kgm: 'kgf.m',
	'kgf·m': 'kgf.m',
	'kg.m': 'kgf.m',
	'lbf.ft': '[lbf_av].[ft_i]',
	'ft.lb': '[lbf_av].[ft_i]',
	'lbf.in': '[lbf_av].[in_i]',
	'in.lb': '[lbf_av].[in_i]',
	l: 'L',
	ml: 'mL',
	cc: 'cm3',
	qt: '[qt_us]',
	psi: '[psi]',
	kpa: 'kPa',
	rpm: '/min',
	'°c': 'Cel',
	'°f': '[degF]',
	in: '[in_i]'
};

function lookup(code: string): UnitDef {
	const def = typeof code === 'string' ? UNIT_DEFS.get(code) : undefined;
	if (def) return def;
	const shown = typeof code === 'string' ? `'${code}'` : String(code);
	const hint = typeof code === 'string' ? CODE_HINTS[code.trim().toLowerCase()] : undefined;
	throw new Error(
		`Unknown unit ${shown}: use a UCUM code such as N.m, kgf.m, L, mL, mm, kPa, [psi], /min or Cel` +
			(hint ? ` (did you mean '${hint}'?)` : '')
	);
}

/** The unit's description, or undefined for a code Benchcall does not know. */
export function unitInfo(code: string): UnitInfo | undefined {
	return UNIT_DEFS.get(code);
}

export function isKnownUnit(code: string): boolean {
	return UNIT_DEFS.has(code);
}

/** The kind of quantity a UCUM code measures, or null for an unknown code. */
export function dimensionOf(code: string): Dimension | null {
	return UNIT_DEFS.get(code)?.dimension ?? null;
}

/** True when both codes are known and measure the same kind of quantity. */
export function canConvert(from: string, to: string): boolean {
	const a = UNIT_DEFS.get(from);
	const b = UNIT_DEFS.get(to);
	return !!a && !!b && a.dimension === b.dimension;
}

/**
 * Converts `value` from one UCUM unit to another, exactly from the definitions, rounded once
 * to the nearest double (8.5 kgf.m → 83.356525 N.m, 950 mL → 0.95 L, no float noise).
 * Throws an Error with a clear message for an unknown unit, units of different kinds
 * (torque to litres), or a value that is not a finite number.
 */
export function convert(value: number, from: string, to: string): number {
	const a = lookup(from);
	const b = lookup(to);
	if (a.dimension !== b.dimension) {
		throw new Error(
			`Cannot convert ${a.symbol} (${a.dimension}) to ${b.symbol} (${b.dimension}): different kinds of quantity`
		);
	}
	if (typeof value !== 'number' || !Number.isFinite(value)) {
		throw new Error(`Cannot convert ${String(value)}: the value must be a finite number`);
	}
	if (a === b) return value;
	// base = (v + offset_a) × scale_a ; v_b = base / scale_b − offset_b
	const base = mul(add(dec(value), a.offset), a.scale);
	return toNumber(sub(div(base, b.scale), b.offset));
}
