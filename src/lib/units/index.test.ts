import ucum from '@lhncbc/ucum-lhc';
import fc from 'fast-check';
import * as math from 'mathjs';
import { describe, expect, it } from 'vitest';
import {
	DIMENSIONS,
	UNITS,
	canConvert,
	convert,
	dimensionOf,
	formatNumber,
	formatQuantity,
	unitFromWords,
	unitInfo,
	unitSymbol,
	unitsOfDimension
} from './index';

const ucumUtils = ucum.UcumLhcUtils.getInstance();

function expectRel(actual: number, expected: number, rel = 1e-9): void {
	const scale = Math.max(Math.abs(expected), 1e-300);
	expect(Math.abs(actual - expected) / scale).toBeLessThanOrEqual(rel);
}

/** Same-dimension pairs of every unit Benchcall knows. */
const PAIRS = UNITS.flatMap((a) =>
	UNITS.filter((b) => b.dimension === a.dimension).map((b) => [a.code, b.code] as const)
);

describe('unit table', () => {
	it('every code is valid UCUM (checked with @lhncbc/ucum-lhc)', () => {
		for (const u of UNITS) {
			expect(ucumUtils.validateUnitString(u.code).status, u.code).toBe('valid');
		}
	});

	it('has the codes the issue lists, with their kind and trade symbol', () => {
		const expected: [string, string, string][] = [
			['N.m', 'torque', 'N·m'],
			['kgf.m', 'torque', 'kgf·m'],
			['kgf.cm', 'torque', 'kgf·cm'],
			['[lbf_av].[ft_i]', 'torque', 'lbf·ft'],
			['[lbf_av].[in_i]', 'torque', 'lbf·in'],
			['L', 'volume', 'L'],
			['mL', 'volume', 'mL'],
			['cm3', 'volume', 'cm³'],
			['[qt_us]', 'volume', 'qt'],
			['[foz_us]', 'volume', 'fl oz'],
			['mm', 'length', 'mm'],
			['cm', 'length', 'cm'],
			['[in_i]', 'length', 'in'],
			['kPa', 'pressure', 'kPa'],
			['bar', 'pressure', 'bar'],
			['[psi]', 'pressure', 'psi'],
			['kgf/cm2', 'pressure', 'kgf/cm²'],
			['V', 'voltage', 'V'],
			['/min', 'rotation', 'rpm'],
			['Cel', 'temperature', '°C'],
			['[degF]', 'temperature', '°F']
		];
		for (const [code, dim, symbol] of expected) {
			expect(dimensionOf(code), code).toBe(dim);
			expect(unitSymbol(code), code).toBe(symbol);
			expect(unitInfo(code)?.common, code).toBe(true);
		}
	});

	it('groups units by dimension, common first, and knows nothing it should not', () => {
		for (const dim of DIMENSIONS) {
			const list = unitsOfDimension(dim);
			expect(list.length).toBeGreaterThan(0);
			const firstRare = list.findIndex((u) => !u.common);
			if (firstRare >= 0) expect(list.slice(firstRare).every((u) => !u.common)).toBe(true);
		}
		expect(dimensionOf('Nm')).toBeNull();
		expect(dimensionOf('')).toBeNull();
		expect(canConvert('N.m', 'kgf.m')).toBe(true);
		expect(canConvert('N.m', 'L')).toBe(false);
		expect(canConvert('N.m', 'nope')).toBe(false);
	});
});

describe('convert against @lhncbc/ucum-lhc', () => {
	it('agrees within 1e-9 (relative) for random values over every same-kind pair', () => {
		// Oracle: @lhncbc/ucum-lhc convertUnitTo(from, v, to).toVal (U.S. National Library of Medicine's UCUM library, npm)
		fc.assert(
			fc.property(
				fc.constantFrom(...PAIRS),
				fc.double({ min: -1e6, max: 1e6, noNaN: true, noDefaultInfinity: true }),
				([from, to], v) => {
					const r = ucumUtils.convertUnitTo(from, v, to);
					expect(r.status).toBe('succeeded');
					const ours = convert(v, from, to);
					if (r.toVal === null) throw new Error('ucum-lhc gave no value');
					// Offset scales (°C, °F) pass through kelvin in the oracle, so near zero its own
					// float error is absolute (~1e-14), not relative: compare with max(|ref|, 1).
					expect(Math.abs(ours - r.toVal)).toBeLessThanOrEqual(
						1e-9 * Math.max(Math.abs(r.toVal), 1)
					);
				}
			),
			{ numRuns: 2000 }
		);
	});

	it('matches the reference figure kgf.m 8 → 78.4532 N.m', () => {
		// @lhncbc/ucum-lhc (U.S. National Library of Medicine's UCUM library, npm)
		expect(ucumUtils.convertUnitTo('kgf.m', 8, 'N.m').toVal).toBeCloseTo(78.4532, 10);
		expect(convert(8, 'kgf.m', 'N.m')).toBe(78.4532);
	});
});

describe('convert against mathjs', () => {
	// mathjs 15 unit names for our UCUM codes (imperial volumes have no mathjs name)
	const MATHJS: Record<string, string> = {
		'N.m': 'N m',
		'kgf.m': 'kgf m',
		'kgf.cm': 'kgf cm',
		'[lbf_av].[ft_i]': 'lbf ft',
		'[lbf_av].[in_i]': 'lbf in',
		'N.cm': 'N cm',
		'daN.m': 'daN m',
		L: 'L',
		mL: 'mL',
		cm3: 'cc',
		'[qt_us]': 'quart',
		'[foz_us]': 'floz',
		'[pt_us]': 'pint',
		'[gal_us]': 'gallon',
		mm: 'mm',
		cm: 'cm',
		'[in_i]': 'in',
		'[mil_i]': 'mil',
		um: 'um',
		m: 'm',
		'[ft_i]': 'ft',
		kPa: 'kPa',
		bar: 'bar',
		'[psi]': 'psi',
		'kgf/cm2': 'kgf/cm^2',
		Pa: 'Pa',
		MPa: 'MPa',
		mbar: 'mbar',
		V: 'V',
		mV: 'mV',
		Ohm: 'ohm',
		kOhm: 'kohm',
		'/min': 'min^-1',
		Cel: 'degC',
		'[degF]': 'degF',
		K: 'K'
	};
	const pairs = PAIRS.filter(([a, b]) => a in MATHJS && b in MATHJS);

	it('covers every common unit', () => {
		for (const u of UNITS.filter((x) => x.common)) expect(MATHJS[u.code], u.code).toBeDefined();
	});

	it('agrees within 1e-9 (relative) for random values', () => {
		// Oracle: mathjs math.unit(v, u).toNumber(u2) (mathjs 15, npm)
		fc.assert(
			fc.property(
				fc.constantFrom(...pairs),
				fc.double({ min: 1e-3, max: 1e5, noNaN: true }),
				([from, to], v) => {
					const ref = math.unit(v, MATHJS[from] ?? '').toNumber(MATHJS[to] ?? '');
					expectRel(convert(v, from, to), ref);
				}
			),
			{ numRuns: 1000 }
		);
	});
});

describe('convert: exact factors (NIST SP 811 App. B.8)', () => {
	it('uses the exact derived factors', () => {
		// NIST SP 811 App. B.8: kgf = 9.80665 N exactly; lb = 0.45359237 kg and ft = 0.3048 m
		// (1959 agreement, [MEM] for the agreement, SP 811 prints the rounded figures checked below)
		expect(convert(1, 'kgf.m', 'N.m')).toBe(9.80665);
		// The exact products of the definitions above, to 16–17 digits, computed in doubles. Our result must be the
		// double nearest to the exact decimal product (worked out by hand from the definitions),
		// e.g. psi → Pa is 6894.757293168361336722673…, whose nearest double prints as …362.
		const nearest = (exactDecimal: string) => Number(exactDecimal);
		expect(convert(1, '[lbf_av].[ft_i]', 'N.m')).toBe(nearest('1.35581794833140040'));
		expect(convert(1, '[lbf_av].[in_i]', 'N.m')).toBe(nearest('0.112984829027616700'));
		expect(convert(1, '[psi]', 'Pa')).toBe(nearest('6894.757293168361336722673'));
		expectRel(convert(1, 'kgf.m', '[lbf_av].[ft_i]'), 7.233013851209894, 1e-15);
		expectRel(convert(1, '[psi]', 'Pa'), 6894.757293168361, 1e-15);
		expect(convert(1, '[lbf_av].[ft_i]', 'N.m')).not.toBe(1.3558179483314);
		expect(convert(1, 'kgf/cm2', 'kPa')).toBe(98.0665);
		// US gallon = 231 in³ (SP 811 App. B.8 prints 3.785412 E-03 m³)
		expect(convert(1, '[gal_us]', 'L')).toBe(3.785411784);
		expect(convert(1, '[qt_us]', 'L')).toBe(0.946352946);
		expect(convert(1, '[foz_us]', 'mL')).toBe(29.5735295625);
		// NIST SP 811 App. B.8: bar = 100 000 Pa, L = 0.001 m³
		expect(convert(1, 'bar', 'kPa')).toBe(100);
		expect(convert(1, 'L', 'mL')).toBe(1000);
		// Imperial gallon 4.54609 L (UK Weights and Measures Act 1985 [MEM])
		expect(convert(1, '[gal_br]', 'L')).toBe(4.54609);
	});

	it('agrees with the 7-digit figures NIST SP 811 App. B.8 prints', () => {
		// NIST SP 811 App. B.8 [SRC]
		expect(convert(1, '[lbf_av].[ft_i]', 'N.m')).toBeCloseTo(1.355818, 6);
		expect(convert(1, '[lbf_av].[in_i]', 'N.m')).toBeCloseTo(0.1129848, 7);
		expect(convert(1, '[psi]', 'Pa')).toBeCloseTo(6894.757, 3);
		expect(convert(1, '[gal_us]', 'L') / 1000).toBeCloseTo(3.785412e-3, 9);
		expect(convert(1, 'kgf.m', 'N.m')).toBeCloseTo(9.80665, 10);
	});

	it('gives worked values derived from NIST SP 811 App. B.8', () => {
		// Derived from the NIST SP 811 (2008) App. B.8 factors
		expect(convert(8, 'kgf.m', 'N.m')).toBe(78.4532);
		expect(convert(8, 'kgf.m', '[lbf_av].[ft_i]')).toBeCloseTo(57.86411, 5);
		expect(convert(40, '[lbf_av].[ft_i]', 'N.m')).toBeCloseTo(54.23272, 5);
		expect(convert(90, '[lbf_av].[in_i]', 'N.m')).toBeCloseTo(10.16863, 5);
		expect(convert(1, 'L', '[qt_us]')).toBeCloseTo(1.056688, 6);
		expect(convert(200, 'kPa', '[psi]')).toBeCloseTo(29.00755, 5);
	});

	it('gives the kgf·m check values a workshop quotes', () => {
		// common practice: figures a workshop quotes for kgf·m specs, products of 9.80665
		expect(convert(5.4, 'kgf.m', 'N.m')).toBeCloseTo(52.95591, 5);
		expect(convert(2.6, 'kgf.m', 'N.m')).toBeCloseTo(25.49729, 5);
		expect(convert(1.2, 'kgf.m', 'N.m')).toBeCloseTo(11.76798, 5);
		expect(convert(5.4, 'kgf.m', 'N.m')).toBe(52.95591);
	});

	it('has no float noise on decimal inputs', () => {
		expect(convert(8.5, 'kgf.m', 'N.m')).toBe(83.356525);
		expect(convert(950, 'mL', 'L')).toBe(0.95);
		expect(convert(0.1, 'L', 'mL')).toBe(100);
		expect(convert(235, 'cm', 'm')).toBe(2.35);
		expect(convert(0.3, 'kgf.m', 'kgf.cm')).toBe(30);
		expect(convert(2.5, 'bar', 'kPa')).toBe(250);
	});

	it('converts temperatures with their offsets', () => {
		// Celsius–Fahrenheit–kelvin definitions (NIST SP 811 §4.2.1.1 [MEM])
		expect(convert(100, 'Cel', '[degF]')).toBe(212);
		expect(convert(32, '[degF]', 'Cel')).toBe(0);
		expect(convert(-40, 'Cel', '[degF]')).toBe(-40);
		expect(convert(0, 'Cel', 'K')).toBe(273.15);
		expect(convert(90, 'Cel', '[degF]')).toBe(194);
	});

	it('round-trips within 1e-12', () => {
		fc.assert(
			fc.property(
				fc.constantFrom(...PAIRS),
				fc.double({ min: -1e6, max: 1e6, noNaN: true }),
				([a, b], v) => {
					const back = convert(convert(v, a, b), b, a);
					expect(Math.abs(back - v)).toBeLessThanOrEqual(Math.abs(v) * 1e-12 + 1e-9);
				}
			),
			{ numRuns: 500 }
		);
	});

	it('returns the value untouched for the same unit', () => {
		expect(convert(0.1 + 0.2, 'mm', 'mm')).toBe(0.1 + 0.2);
	});
});

describe('convert: clear errors', () => {
	it('rejects an unknown unit and names it, with a hint', () => {
		expect(() => convert(1, 'Nm', 'N.m')).toThrow(/Unknown unit 'Nm'.*did you mean 'N\.m'/);
		expect(() => convert(1, 'N.m', 'furlong')).toThrow(/Unknown unit 'furlong'/);
	});

	it('rejects different kinds of quantity', () => {
		expect(() => convert(80, 'N.m', 'L')).toThrow(
			/Cannot convert N·m \(torque\) to L \(volume\): different kinds/
		);
		expect(() => convert(1, 'mm', 'Cel')).toThrow(/different kinds/);
	});

	it('rejects a value that is not a finite number', () => {
		expect(() => convert(Number.NaN, 'N.m', 'kgf.m')).toThrow(/finite number/);
		expect(() => convert(Infinity, 'N.m', 'kgf.m')).toThrow(/finite number/);
	});
});

describe('unitFromWords', () => {
	const cases: [string, string][] = [
		// every way a workshop writes these units
		['Nm', 'N.m'],
		['N·m', 'N.m'],
		['N m', 'N.m'],
		['newton metres', 'N.m'],
		['newton meters', 'N.m'],
		['kgf m', 'kgf.m'],
		['kg-m', 'kgf.m'],
		['kgm', 'kgf.m'],
		['kilogram metres', 'kgf.m'],
		['ft-lb', '[lbf_av].[ft_i]'],
		['ft lbs', '[lbf_av].[ft_i]'],
		['foot pounds', '[lbf_av].[ft_i]'],
		['lb-ft', '[lbf_av].[ft_i]'],
		['pound feet', '[lbf_av].[ft_i]'],
		['in-lb', '[lbf_av].[in_i]'],
		['inch pounds', '[lbf_av].[in_i]'],
		['l', 'L'],
		['litre', 'L'],
		['litres', 'L'],
		['liter', 'L'],
		['liters', 'L'],
		['ml', 'mL'],
		['cc', 'cm3'],
		['quart', '[qt_us]'],
		['quarts', '[qt_us]'],
		['qt', '[qt_us]'],
		['mm', 'mm'],
		['millimetre', 'mm'],
		['millimetres', 'mm'],
		['inch', '[in_i]'],
		['inches', '[in_i]'],
		['psi', '[psi]'],
		['bar', 'bar'],
		['kpa', 'kPa'],
		['kilopascals', 'kPa'],
		['volt', 'V'],
		['volts', 'V'],
		['rpm', '/min'],
		['°C', 'Cel'],
		['degrees c', 'Cel'],
		// more of what a workshop writes or says
		['NM', 'N.m'],
		['n.m', 'N.m'],
		['N-m', 'N.m'],
		['newton-metres', 'N.m'],
		['Nms', 'N.m'],
		['kgf·m', 'kgf.m'],
		['kgf-m', 'kgf.m'],
		['kilogram-force metres', 'kgf.m'],
		['kilograms metre', 'kgf.m'],
		['m-kg', 'kgf.m'],
		['kgf·cm', 'kgf.cm'],
		['daN·m', 'daN.m'],
		['kg-cm', 'kgf.cm'],
		['kgcm', 'kgf.cm'],
		['lbf·ft', '[lbf_av].[ft_i]'],
		['lbf.ft', '[lbf_av].[ft_i]'],
		['ftlb', '[lbf_av].[ft_i]'],
		['foot-pounds', '[lbf_av].[ft_i]'],
		['pound-feet', '[lbf_av].[ft_i]'],
		['in lbs', '[lbf_av].[in_i]'],
		['lbf·in', '[lbf_av].[in_i]'],
		['inch-pounds', '[lbf_av].[in_i]'],
		['pound inches', '[lbf_av].[in_i]'],
		['L', 'L'],
		['ltr', 'L'],
		['mL', 'mL'],
		['millilitres', 'mL'],
		['milliliters', 'mL'],
		['cm³', 'cm3'],
		['cubic centimetres', 'cm3'],
		['fl oz', '[foz_us]'],
		['fl. oz.', '[foz_us]'],
		['fluid ounces', '[foz_us]'],
		['US quarts', '[qt_us]'],
		['imperial pints', '[pt_br]'],
		['millimeters', 'mm'],
		['thou', '[mil_i]'],
		['thousandths of an inch', '[mil_i]'],
		['µm', 'um'],
		['microns', 'um'],
		['kPa', 'kPa'],
		['kilo pascals', 'kPa'],
		['PSI', '[psi]'],
		['pounds per square inch', '[psi]'],
		['kgf/cm²', 'kgf/cm2'],
		['kg/cm2', 'kgf/cm2'],
		['kilograms per square centimetre', 'kgf/cm2'],
		['V', 'V'],
		['ohms', 'Ohm'],
		['Ω', 'Ohm'],
		['kΩ', 'kOhm'],
		['r/min', '/min'],
		['rev/min', '/min'],
		['revs', '/min'],
		['revolutions per minute', '/min'],
		['min⁻¹', '/min'],
		['℃', 'Cel'],
		['degrees celsius', 'Cel'],
		['deg C', 'Cel'],
		['°F', '[degF]'],
		['degrees fahrenheit', '[degF]'],
		// UCUM codes pass through unchanged
		['[lbf_av].[ft_i]', '[lbf_av].[ft_i]'],
		['/min', '/min'],
		['Cel', 'Cel']
	];
	it.each(cases)('maps %j to %s', (words, code) => {
		expect(unitFromWords(words)).toBe(code);
	});

	it('returns null for words that are not a unit, or are ambiguous', () => {
		for (const w of ['', '   ', 'bolt', 'degrees', 'furlong', 'x'.repeat(500), 'rear axle']) {
			expect(unitFromWords(w), w).toBeNull();
		}
	});
});

describe('formatQuantity', () => {
	it('uses the trade symbols', () => {
		expect(formatQuantity(80, 'N.m')).toBe('80 N·m');
		expect(formatQuantity(5.4, 'kgf.m')).toBe('5.4 kgf·m');
		expect(formatQuantity(30, 'kgf.cm')).toBe('30 kgf·cm');
		expect(formatQuantity(40, '[lbf_av].[ft_i]')).toBe('40 lbf·ft');
		expect(formatQuantity(90, '[lbf_av].[in_i]')).toBe('90 lbf·in');
		expect(formatQuantity(1.1, 'L')).toBe('1.1 L');
		expect(formatQuantity(120, 'mL')).toBe('120 mL');
		expect(formatQuantity(125, 'cm3')).toBe('125 cm³');
		expect(formatQuantity(1.2, '[qt_us]')).toBe('1.2 qt');
		expect(formatQuantity(4.5, '[foz_us]')).toBe('4.5 fl oz');
		expect(formatQuantity(30, 'mm')).toBe('30 mm');
		expect(formatQuantity(2.5, 'cm')).toBe('2.5 cm');
		expect(formatQuantity(0.004, '[in_i]')).toBe('0.004 in');
		expect(formatQuantity(250, 'kPa')).toBe('250 kPa');
		expect(formatQuantity(2.5, 'bar')).toBe('2.5 bar');
		expect(formatQuantity(36, '[psi]')).toBe('36 psi');
		expect(formatQuantity(2.5, 'kgf/cm2')).toBe('2.5 kgf/cm²');
		expect(formatQuantity(12.6, 'V')).toBe('12.6 V');
		expect(formatQuantity(1400, '/min')).toBe('1400 rpm');
		expect(formatQuantity(90, 'Cel')).toBe('90 °C');
		expect(formatQuantity(194, '[degF]')).toBe('194 °F');
	});

	it('rounds sensibly', () => {
		expect(formatQuantity(83.356525, 'N.m')).toBe('83.36 N·m');
		expect(formatQuantity(133.08088303125, 'mL')).toBe('133.1 mL');
		expect(formatQuantity(1.0566882094325938, '[qt_us]')).toBe('1.057 qt');
		expect(formatQuantity(0.0015, '[in_i]')).toBe('0.0015 in');
		expect(formatQuantity(12345.6, '/min')).toBe('12346 rpm');
		expect(formatQuantity(0.1 + 0.2, 'mm')).toBe('0.3 mm');
		expect(formatQuantity(-0.00001, 'Cel')).toBe('0 °C');
		expect(formatQuantity(83.356525, 'N.m', { decimals: 1 })).toBe('83.4 N·m');
		expect(formatNumber(2.5, { decimals: 2 })).toBe('2.50');
	});

	it('speaks units for read-back', () => {
		expect(formatQuantity(80, 'N.m', { spoken: true })).toBe('80 newton metres');
		expect(formatQuantity(1, 'L', { spoken: true })).toBe('1 litre');
		expect(formatQuantity(1400, '/min', { spoken: true })).toBe('1400 rpm');
	});

	it('never throws on odd input', () => {
		expect(formatQuantity(Number.NaN, 'N.m')).toBe('— N·m');
		expect(formatQuantity(3, 'furlong')).toBe('3 furlong');
	});
});
