import { UNIT_DEFS } from './table';

/**
 * Written and spoken unit words, after normalising (lower case, separators · - . * as spaces,
 * '/' as ' per '). Plural 's' is stripped word by word before lookup, so only singular forms
 * and irregular plurals need listing; spaceless forms ('kgfm', 'ftlb') are added automatically.
 */
const WORDS: Record<string, string[]> = {
	'N.m': [
		'n m',
		'newton metre',
		'newton meter',
		'newton m',
		'newtonmetre',
		'newtonmeter',
		// "80 newtons" on a torque step is how people say N·m at the bench (common practice)
		'newton'
	],
	'kgf.m': [
		'kgf m',
		'kg m',
		'kg f m',
		'kilogram metre',
		'kilogram meter',
		'kilogram force metre',
		'kilogram force meter',
		'kilo metre force',
		'm kg',
		'm kgf',
		'kilogram m',
		'kgf metre',
		'kgf meter'
	],
	'kgf.cm': [
		'kgf cm',
		'kg cm',
		'kg f cm',
		'kilogram centimetre',
		'kilogram centimeter',
		'kilogram force centimetre',
		'kilogram force centimeter',
		'cm kg',
		'cm kgf',
		'kgf centimetre',
		'kgf centimeter'
	],
	'[lbf_av].[ft_i]': [
		'lbf ft',
		'lb ft',
		'ft lb',
		'ft lbf',
		'foot pound',
		'foot pound force',
		'feet pound',
		'pound foot',
		'pound feet',
		'pound force foot',
		'pound force feet',
		'ft pound',
		'pound ft',
		'lbf foot',
		'lbf feet'
	],
	'[lbf_av].[in_i]': [
		'lbf in',
		'lb in',
		'in lb',
		'in lbf',
		'inch pound',
		'inch pound force',
		'pound inch',
		'pound inches',
		'pound force inch',
		'pound force inches',
		'inches pound',
		'in pound',
		'pound in'
	],
	'daN.m': ['dan m', 'decanewton metre', 'decanewton meter', 'deca newton metre'],
	'N.cm': ['n cm', 'newton centimetre', 'newton centimeter'],
	L: ['l', 'litre', 'liter', 'lt', 'ltr'],
	mL: ['ml', 'millilitre', 'milliliter', 'mil litre', 'mil liter'],
	cm3: ['cc', 'cm3', 'cubic centimetre', 'cubic centimeter', 'cu cm', 'ccm', 'cubic cm'],
	'[qt_us]': ['qt', 'quart', 'us quart', 'us qt', 'u s quart'],
	'[foz_us]': [
		'fl oz',
		'fluid ounce',
		'fluid oz',
		'fl ounce',
		'us fl oz',
		'us fluid ounce',
		'oz',
		'ounce'
	],
	'[pt_us]': ['pt', 'pint', 'us pint', 'us pt'],
	'[gal_us]': ['gal', 'gallon', 'us gallon', 'us gal'],
	'[pt_br]': ['imperial pint', 'imp pint', 'imp pt', 'uk pint'],
	'[qt_br]': ['imperial quart', 'imp quart', 'imp qt', 'uk quart'],
	'[gal_br]': ['imperial gallon', 'imp gallon', 'imp gal', 'uk gallon'],
	mm: ['mm', 'millimetre', 'millimeter'],
	cm: ['cm', 'centimetre', 'centimeter'],
	'[in_i]': ['in', 'inch', 'inches', '"', 'inche'],
	'[mil_i]': ['thou', 'thousandth', 'thousandth of an inch', 'thousandths of an inch'],
	um: ['um', 'µm', 'μm', 'micron', 'micrometre', 'micrometer'],
	m: ['m', 'metre', 'meter'],
	'[ft_i]': ['ft', 'foot', 'feet'],
	kPa: ['kpa', 'kilopascal', 'kilo pascal', 'kpag'],
	bar: ['bar'],
	'[psi]': [
		'psi',
		'psig',
		'pound per square inch',
		'pound force per square inch',
		'lb per in2',
		'lbf per in2',
		'lb per sq in',
		'lb per square inch'
	],
	'kgf/cm2': [
		'kgf per cm2',
		'kg per cm2',
		'kgf cm2',
		'kg cm2',
		'kgf per square cm',
		'kg per square cm',
		'kgf per sq cm',
		'kg per sq cm',
		'kilogram per square centimetre',
		'kilogram per square centimeter',
		'kilogram force per square centimetre',
		'kilogram force per square centimeter',
		'kilogram per cm2',
		'kilo per square centimetre'
	],
	Pa: ['pa', 'pascal'],
	MPa: ['mpa', 'megapascal'],
	mbar: ['mbar', 'millibar'],
	V: ['v', 'volt', 'vdc', 'v dc', 'volt dc'],
	mV: ['mv', 'millivolt'],
	Ohm: ['ohm', 'ω', 'ω ohm'],
	kOhm: ['kohm', 'kω', 'kilohm', 'kilo ohm', 'k ohm', 'k ω'],
	'/min': [
		'rpm',
		'r per min',
		'rev per min',
		'rev per minute',
		'revolution per minute',
		'revolution a minute',
		'rev a minute',
		'per min',
		'1 per min',
		'min 1',
		'rev',
		'revolution',
		'r min'
	],
	Cel: [
		'°c',
		'° c',
		'c',
		'degc',
		'deg c',
		'degree c',
		'degree celsius',
		'celsius',
		'centigrade',
		'degree centigrade',
		'cel',
		'celsiu',
		'degree celsiu'
	],
	'[degF]': [
		'°f',
		'° f',
		'f',
		'degf',
		'deg f',
		'degree f',
		'degree fahrenheit',
		'fahrenheit',
		'deg fahrenheit'
	],
	K: ['kelvin']
};

// Words whose trailing 's' is not a plural.
const KEEP_S = /(?:ss|us|is|psi)$|^(?:s|us|lbs?|ms)$/;

/** Lower-cases and flattens separators the way the word list is written. */
export function normalizeUnitText(text: string): string {
	return text
		.replace(/º/g, '°')
		.normalize('NFKC')
		.toLowerCase()
		.replace(/[\u2010-\u2015\u2212]/g, '-')
		.replace(/[\u00b7\u22c5\u2022\u2219\u00d7*]/g, ' ')
		.replace(/\//g, ' per ')
		.replace(/(?<=[a-zµμω°])[.-](?=[a-zµμω0-9])|[-_]/g, ' ')
		.replace(/(?<=[a-z])\.(?=\s|$)/g, '')
		.replace(/\s+/g, ' ')
		.trim();
}

function singular(word: string): string {
	if (word === 'lbs') return 'lb';
	if (word.length > 2 && word.endsWith('s') && !KEEP_S.test(word)) return word.slice(0, -1);
	return word;
}

const GLUE = new Set(['of', 'the', 'a', 'an']);

/** Singular words without glue words, so 'thousandths of an inch' meets 'thousandth inch'. */
function canonical(normalized: string): string {
	return normalized
		.split(' ')
		.map(singular)
		.filter((w) => !GLUE.has(w))
		.join(' ');
}

const MAP = new Map<string, string>();
for (const [code, words] of Object.entries(WORDS)) {
	for (const w of words) {
		for (const key of [normalizeUnitText(w), canonical(normalizeUnitText(w))]) {
			if (!MAP.has(key)) MAP.set(key, code);
			const tight = key.replace(/ /g, '');
			if (!MAP.has(tight)) MAP.set(tight, code);
		}
	}
}

/** The longest number of words any unit phrase takes, for callers that scan a token stream. */
export const MAX_UNIT_WORDS = 7;

/**
 * Maps a written or spoken unit ("Nm", "N·m", "newton metres", "kg-m", "ft lbs", "cc",
 * "degrees c", "kgf/cm²" …) or a UCUM code to the UCUM code Benchcall stores; null when it
 * is not a unit Benchcall knows, or is ambiguous ("degrees" alone may be an angle).
 */
export function unitFromWords(text: string): string | null {
	if (typeof text !== 'string') return null;
	const raw = text.trim();
	if (raw.length === 0 || raw.length > 80) return null;
	if (UNIT_DEFS.has(raw)) return raw;
	const n = normalizeUnitText(raw);
	if (n.length === 0) return null;
	const direct = MAP.get(n) ?? MAP.get(n.replace(/ /g, ''));
	if (direct) return direct;
	const c = canonical(n);
	return MAP.get(c) ?? MAP.get(c.replace(/ /g, '')) ?? null;
}
