import { dec, div, mul, pow, rat, type Rational } from './rational';

/** The kinds of quantity a step can be measured in. Torque and energy share SI dimensions, so
 * the kind is stored, never inferred from base units. */
export type Dimension =
	| 'torque'
	| 'volume'
	| 'length'
	| 'pressure'
	| 'voltage'
	| 'resistance'
	| 'rotation'
	| 'temperature';

export const DIMENSIONS: readonly Dimension[] = [
	'torque',
	'volume',
	'length',
	'pressure',
	'voltage',
	'resistance',
	'rotation',
	'temperature'
];

export interface UnitInfo {
	/** UCUM code, case-sensitive, as stored in the database. */
	readonly code: string;
	readonly dimension: Dimension;
	/** The trade's symbol, for screens: N·m, kgf·m, lbf·ft, psi, °C … */
	readonly symbol: string;
	/** Spoken singular and plural, for read-back ("80 newton metres"). */
	readonly name: string;
	readonly plural: string;
	/** True for the units a workshop uses every day; the picker lists these first. */
	readonly common: boolean;
}

export interface UnitDef extends UnitInfo {
	/** value in the dimension's base unit = (value + offset) × scale */
	readonly scale: Rational;
	readonly offset: Rational;
}

// Definitions (NIST SP 811 (2008), App. B.8; 1959 international yard and pound agreement): exact by definition, everything else is derived from these.
const G_N = dec('9.80665'); // standard gravity, m/s² (NIST SP 811 App. B.8)
const LB = dec('0.45359237'); // avoirdupois pound, kg (1959 agreement)
const IN = dec('0.0254'); // international inch, m (1959 agreement)
const FT = dec('0.3048'); // international foot, m
const GAL_US_L = mul(mul(dec('231'), pow(IN, 3)), dec('1000')); // 231 in³ in litres
const GAL_IMP_L = dec('4.54609'); // imperial gallon, litres (UK Weights and Measures Act 1985)
const LBF = mul(LB, G_N); // pound-force in newtons
const KGF = G_N; // kilogram-force in newtons
const ONE = rat(1n);
const ZERO = rat(0n);

function u(
	code: string,
	dimension: Dimension,
	symbol: string,
	name: string,
	plural: string,
	scale: Rational,
	common = true,
	offset: Rational = ZERO
): UnitDef {
	return { code, dimension, symbol, name, plural, scale, offset, common };
}

/** Base units: N·m, L, m, Pa, V, Ω, 1/min, °C. Order: the picker's order within a dimension. */
const DEFS: UnitDef[] = [
	u('N.m', 'torque', 'N·m', 'newton metre', 'newton metres', ONE),
	u('kgf.m', 'torque', 'kgf·m', 'kilogram-force metre', 'kilogram-force metres', KGF),
	u(
		'kgf.cm',
		'torque',
		'kgf·cm',
		'kilogram-force centimetre',
		'kilogram-force centimetres',
		div(KGF, dec('100'))
	),
	u('[lbf_av].[ft_i]', 'torque', 'lbf·ft', 'pound-foot', 'pound-feet', mul(LBF, FT)),
	u('[lbf_av].[in_i]', 'torque', 'lbf·in', 'pound-inch', 'pound-inches', mul(LBF, IN)),
	u('daN.m', 'torque', 'daN·m', 'decanewton metre', 'decanewton metres', dec('10'), false),
	u('N.cm', 'torque', 'N·cm', 'newton centimetre', 'newton centimetres', dec('0.01'), false),

	u('L', 'volume', 'L', 'litre', 'litres', ONE),
	u('mL', 'volume', 'mL', 'millilitre', 'millilitres', dec('0.001')),
	u('cm3', 'volume', 'cm³', 'cubic centimetre', 'cubic centimetres', dec('0.001')),
	u('[qt_us]', 'volume', 'qt', 'US quart', 'US quarts', div(GAL_US_L, dec('4'))),
	u('[foz_us]', 'volume', 'fl oz', 'US fluid ounce', 'US fluid ounces', div(GAL_US_L, dec('128'))),
	u('[pt_us]', 'volume', 'pt', 'US pint', 'US pints', div(GAL_US_L, dec('8')), false),
	u('[gal_us]', 'volume', 'gal', 'US gallon', 'US gallons', GAL_US_L, false),
	u(
		'[pt_br]',
		'volume',
		'imp pt',
		'imperial pint',
		'imperial pints',
		div(GAL_IMP_L, dec('8')),
		false
	),
	u(
		'[qt_br]',
		'volume',
		'imp qt',
		'imperial quart',
		'imperial quarts',
		div(GAL_IMP_L, dec('4')),
		false
	),
	u('[gal_br]', 'volume', 'imp gal', 'imperial gallon', 'imperial gallons', GAL_IMP_L, false),

	u('mm', 'length', 'mm', 'millimetre', 'millimetres', dec('0.001')),
	u('cm', 'length', 'cm', 'centimetre', 'centimetres', dec('0.01')),
	u('[in_i]', 'length', 'in', 'inch', 'inches', IN),
	u('[mil_i]', 'length', 'thou', 'thou', 'thou', mul(IN, dec('0.001')), false),
	u('um', 'length', 'µm', 'micrometre', 'micrometres', dec('0.000001'), false),
	u('m', 'length', 'm', 'metre', 'metres', ONE, false),
	u('[ft_i]', 'length', 'ft', 'foot', 'feet', FT, false),

	u('kPa', 'pressure', 'kPa', 'kilopascal', 'kilopascals', dec('1000')),
	u('bar', 'pressure', 'bar', 'bar', 'bar', dec('100000')),
	u(
		'[psi]',
		'pressure',
		'psi',
		'pound per square inch',
		'pounds per square inch',
		div(LBF, pow(IN, 2))
	),
	u(
		'kgf/cm2',
		'pressure',
		'kgf/cm²',
		'kilogram-force per square centimetre',
		'kilograms-force per square centimetre',
		div(KGF, dec('0.0001'))
	),
	u('Pa', 'pressure', 'Pa', 'pascal', 'pascals', ONE, false),
	u('MPa', 'pressure', 'MPa', 'megapascal', 'megapascals', dec('1000000'), false),
	u('mbar', 'pressure', 'mbar', 'millibar', 'millibar', dec('100'), false),

	u('V', 'voltage', 'V', 'volt', 'volts', ONE),
	u('mV', 'voltage', 'mV', 'millivolt', 'millivolts', dec('0.001'), false),

	u('Ohm', 'resistance', 'Ω', 'ohm', 'ohms', ONE),
	u('kOhm', 'resistance', 'kΩ', 'kilohm', 'kilohms', dec('1000')),

	u('/min', 'rotation', 'rpm', 'rpm', 'rpm', ONE),

	u('Cel', 'temperature', '°C', 'degree Celsius', 'degrees Celsius', ONE),
	u(
		'[degF]',
		'temperature',
		'°F',
		'degree Fahrenheit',
		'degrees Fahrenheit',
		div(dec('5'), dec('9')),
		true,
		dec('-32')
	),
	u('K', 'temperature', 'K', 'kelvin', 'kelvins', ONE, false, dec('-273.15'))
];

export const UNIT_DEFS: ReadonlyMap<string, UnitDef> = new Map(DEFS.map((d) => [d.code, d]));

/** Every unit Benchcall knows, grouped by dimension, common ones first within each group. */
export const UNITS: readonly UnitInfo[] = DIMENSIONS.flatMap((dim) =>
	DEFS.filter((d) => d.dimension === dim)
		.sort((a, b) => Number(b.common) - Number(a.common))
		.map(({ code, dimension, symbol, name, plural, common }) => ({
			code,
			dimension,
			symbol,
			name,
			plural,
			common
		}))
);
