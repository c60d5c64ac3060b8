/**
 * The offline recogniser decodes a finite-state grammar, not free speech. This builds that
 * grammar (JSGF) from the job in front of the technician: its step labels and aliases, the
 * intents the phrase engine knows (next, spec, history, done, undo, note, new/replaced, cancel),
 * numbers as spoken (zero to 999, "point" and decimals, and hundreds and thousands for revs) and the spoken unit words of the
 * job's kinds of quantity. Pure: the pronunciation dictionary comes in as a lookup function,
 * so the same code runs against the model's dictionary in Node and in the browser.
 */
import { dimensionOf } from '../units/index';
import { isWrongScale } from './scale';

export interface GrammarStep {
	label: string;
	aliases?: string[];
	unit?: string | null;
	/** The fluid spec as the manual writes it ("SAE 10W-40, JASO MA2", "DOT 4"). */
	fluid?: string | null;
}

export interface GrammarInput {
	steps: GrammarStep[];
	/** Names of parts the job may fit ("drain plug washer"), for "new …" and "… replaced". */
	parts?: string[];
	/**
	 * Weight of the out-of-grammar path against the calls (0 leaves it out): a loop of single
	 * phones that soaks up speech no call fits (shop talk, noise), so it is not forced into the
	 * nearest call. Heard words from it start with `GARBAGE_PREFIX`. Default `GARBAGE_WEIGHT`.
	 */
	garbage?: number;
}

/** The model's phones (CMU set), one garbage word each. */
const PHONES =
	'AA AE AH AO AW AY B CH D DH EH ER EY F G HH IH IY JH K L M N NG OW OY P R S SH T TH UH UW V W Y Z ZH'.split(
		' '
	);
export const GARBAGE_PREFIX = 'zz_';
/** Default weight of the out-of-grammar path (the calls weigh 1); measured on the tuning split. */
export const GARBAGE_WEIGHT = 1e-4;

/** The model dictionary: a word's phones ("S P EH K"), or null when the word is unknown. */
export type Lookup = (word: string) => string | null;

export interface VoiceGrammar {
	jsgf: string;
	/** Every word the grammar uses. */
	words: string[];
	/** Words not in the dictionary with pronunciations made here from known words. */
	added: [string, string][];
	/** Words with no pronunciation: the phrases holding them were left out. */
	missing: string[];
}

// --- numbers ------------------------------------------------------------------------------------

const ONES = ['zero', 'one', 'two', 'three', 'four', 'five', 'six', 'seven', 'eight', 'nine'];
const TEENS = [
	'ten',
	'eleven',
	'twelve',
	'thirteen',
	'fourteen',
	'fifteen',
	'sixteen',
	'seventeen',
	'eighteen',
	'nineteen'
];
const TENS = ['', '', 'twenty', 'thirty', 'forty', 'fifty', 'sixty', 'seventy', 'eighty', 'ninety'];

/** A whole number 0–999 in words, as the grammar says it ("one hundred and five"). */
export function numberWords(n: number): string {
	if (!Number.isInteger(n) || n < 0 || n > 999) throw new RangeError(`not 0–999: ${n}`);
	if (n < 10) return ONES[n];
	if (n < 20) return TEENS[n - 10];
	if (n < 100) return TENS[Math.floor(n / 10)] + (n % 10 ? ' ' + ONES[n % 10] : '');
	const rest = n % 100;
	return ONES[Math.floor(n / 100)] + ' hundred' + (rest ? ' and ' + numberWords(rest) : '');
}

// --- units --------------------------------------------------------------------------------------

/**
 * How units are said aloud, by UCUM code. Every phrase here must read back to its code through
 * `unitFromWords` (a unit test checks), so the phrase engine understands what the grammar
 * lets the recogniser hear.
 */
export const SPOKEN_UNITS: Record<string, string[]> = {
	'N.m': ['newton metres', 'newton meters', 'newton metre', 'newtons'],
	'kgf.m': ['kilogram metres', 'kilogram force metres'],
	'kgf.cm': ['kilogram centimetres'],
	'[lbf_av].[ft_i]': ['foot pounds', 'pound feet'],
	'[lbf_av].[in_i]': ['inch pounds'],
	'daN.m': ['decanewton metres'],
	'N.cm': ['newton centimetres'],
	L: ['litres', 'litre', 'liters', 'liter'],
	mL: ['millilitres', 'milliliters'],
	cm3: ['cubic centimetres', 'c c'],
	'[qt_us]': ['quarts', 'quart'],
	'[foz_us]': ['fluid ounces', 'ounces'],
	'[pt_us]': ['pints'],
	mm: ['millimetres', 'millimeters', 'millimetre'],
	cm: ['centimetres', 'centimeters'],
	'[in_i]': ['inches', 'inch'],
	'[mil_i]': ['thou'],
	kPa: ['kilopascals', 'k p a'],
	bar: ['bar'],
	'[psi]': ['p s i', 'pounds per square inch'],
	V: ['volts', 'volt'],
	mV: ['millivolts'],
	Ohm: ['ohms'],
	kOhm: ['kilo ohms'],
	'/min': ['r p m', 'revs per minute'],
	Cel: ['degrees celsius'],
	'[degF]': ['degrees fahrenheit']
};

/**
 * The unit phrases a step may be called out in: its own kind of quantity, less the units one
 * metric prefix away from its own that sound alike ("newton centimetres" for a step in newton
 * metres, "millimetres" for one in centimetres). The decoder cannot hear what the grammar does
 * not hold, so a mishearing of "metres" as "millimetres" becomes a near miss of the step's own
 * unit instead of a value 1000× off. `jobUnits`, the units of the job's other steps, take out
 * their alike-sounding scales too, since the grammar lists one set of unit words for all the
 * job's steps. A step without a unit takes none.
 */
export function stepUnitPhrases(step: GrammarStep, jobUnits: readonly string[] = []): string[] {
	const kind = step.unit ? dimensionOf(step.unit) : null;
	if (!step.unit || !kind) return [];
	const units = [step.unit, ...jobUnits];
	const out: string[] = [];
	for (const [code, phrases] of Object.entries(SPOKEN_UNITS)) {
		if (dimensionOf(code) !== kind) continue;
		// left out when it is the alike-sounding scale of any step's unit, unless a step is in it
		if (!units.includes(code) && units.some((u) => isWrongScale(code, u))) continue;
		out.push(...phrases);
	}
	return out;
}

// --- intents ------------------------------------------------------------------------------------

const NEXT = ['next', 'next step', 'what is next', 'whats next'];
const UNDO = ['undo', 'undo that', 'undo last entry', 'scratch that'];
const CANCEL = ['cancel', 'cancel that', 'never mind'];
const SPEC_PREFIX = ['spec', 'spec for', 'what is the spec for', 'whats the spec for'];
const HISTORY_PREFIX = ['history', 'history of', 'past readings for'];
const DONE_PREFIX = ['done', 'mark done', 'finished'];
const DONE_SUFFIX = ['done', 'checked', 'okay'];
const PART_PREFIX = ['new', 'fitted new', 'replaced'];
const PART_SUFFIX = ['replaced', 'renewed', 'fitted'];
/** Words a short note may hold besides the job's own words (common practice at the bench). */
const NOTE_WORDS = (
	'a the is are and on at left right front rear top bottom upper lower inner outer worn ' +
	'loose tight leaking weeping cracked damaged missing dirty clean seized noisy bent broken ' +
	'low high ok good needs check customer told seal gasket hose cable bolt nut washer'
).split(' ');

// --- fluid grades -------------------------------------------------------------------------------

/**
 * Multigrades common on motorcycles (common practice, from memory): hearable even when no spec
 * lists them, so a wrong grade is heard as itself and judged, not forced onto the spec's.
 */
const COMMON_SAE = ['0W-20', '5W-30', '5W-40', '10W-30', '10W-40', '10W-50', '15W-50', '20W-50'];

/**
 * How a grade is said, by the families a job's fluid specs name: SAE J300 viscosity grades
 * ("ten w forty": the specs' own and the common ones), API S service categories (API 1509:
 * "api s l"), JASO T 903 classes ("jaso m a two") and FMVSS 116 brake fluid classes ("dot five
 * point one"). Said after the quantity's unit, in that order: before the value, "ten w forty one
 * point one" would read as 41.1. The phrase engine reads them (`phrase/fluid.ts`) and judges
 * them against the step's spec.
 */
export function gradeFamilies(
	specs: readonly string[]
): Record<'sae' | 'api' | 'jaso' | 'dot', string[]> {
	const text = specs.join(' ').toUpperCase();
	const listed = [...text.matchAll(/(\d{1,2})W-(\d{2})/g)].map((m) => `${Number(m[1])}W-${m[2]}`);
	const sae = /\d+W-\d+|SAE/.test(text) ? [...new Set([...listed, ...COMMON_SAE])] : [];
	return {
		sae: sae.map((g) => {
			const [w, h] = g.split('W-').map(Number);
			return `${numberWords(w)} w ${numberWords(h)}`;
		}),
		api: /API/.test(text) ? 'g h j l m n p'.split(' ').map((c) => `api s ${c}`) : [],
		jaso: /JASO/.test(text) ? ['jaso m a', 'jaso m a one', 'jaso m a two', 'jaso m b'] : [],
		dot: /DOT/.test(text) ? ['dot three', 'dot four', 'dot five', 'dot five point one'] : []
	};
}

// --- words and pronunciations -------------------------------------------------------------------

/** Lower-case words of a label: letters and apostrophes; digits said as numbers. */
export function spokenWords(text: string): string[] {
	const out: string[] = [];
	for (const raw of text.toLowerCase().split(/[^a-z0-9']+/)) {
		const w = raw.replace(/^'+|'+$/g, '');
		if (!w) continue;
		if (/^\d+$/.test(w)) {
			const n = Number(w);
			if (n <= 999) out.push(...numberWords(n).split(' '));
			else out.push(w);
			continue;
		}
		for (const part of w.split(/(?<=\D)(?=\d)|(?<=\d)(?=\D)/)) {
			if (/^\d+$/.test(part) && Number(part) <= 999)
				out.push(...numberWords(Number(part)).split(' '));
			else out.push(part);
		}
	}
	return out;
}

const VOICELESS = new Set(['P', 'T', 'K', 'F', 'TH']);
const SIBILANT = new Set(['S', 'Z', 'SH', 'ZH', 'CH', 'JH']);

/**
 * A pronunciation for a word: from the dictionary, else built from known words — the
 * American spelling ("litres" → "liters"), a plural of a known word ("newtons"), or two known
 * words run together ("tickover", "countershaft"). Null when none of these works.
 */
export function pronounce(word: string, lookup: Lookup, depth = 0): string | null {
	if (!/^[a-z']+$/.test(word)) return null;
	const known = lookup(word);
	if (known) return known;
	if (depth > 2) return null;
	const american = word
		.replace(/tre(s?)$/, 'ter$1')
		.replace(/yre(s?)$/, 'ire$1')
		.replace(/our(s?)$/, 'or$1');
	if (american !== word) {
		const p = lookup(american);
		if (p) return p;
	}
	if (word.length > 3 && word.endsWith('s') && !word.endsWith('ss')) {
		const stem = pronounce(word.slice(0, -1), lookup, depth + 1);
		if (stem) {
			const last = stem.split(' ').at(-1) ?? '';
			const tail = SIBILANT.has(last) ? 'IH Z' : VOICELESS.has(last) ? 'S' : 'Z';
			return `${stem} ${tail}`;
		}
	}
	for (let i = word.length - 3; i >= 3; i--) {
		const head = lookup(word.slice(0, i));
		if (!head) continue;
		const tail = pronounce(word.slice(i), lookup, depth + 1);
		if (tail) return `${head} ${tail}`;
	}
	return null;
}

// --- the grammar --------------------------------------------------------------------------------

function alternatives(phrases: Iterable<string>): string {
	return [...phrases].map((p) => (p.includes(' ') ? `(${p})` : p)).join(' | ');
}

/** Builds the JSGF grammar for a job. Never throws; unknown words are reported in `missing`. */
export function buildGrammar(input: GrammarInput, lookup: Lookup): VoiceGrammar {
	const prons = new Map<string, string | null>();
	const added: [string, string][] = [];
	const missing = new Set<string>();
	const pron = (w: string): string | null => {
		if (!prons.has(w)) {
			const direct = /^[a-z']+$/.test(w) ? lookup(w) : null;
			const p = direct ?? pronounce(w, lookup);
			prons.set(w, p);
			if (!direct && p) added.push([w, p]);
		}
		return prons.get(w) ?? null;
	};
	/** The phrase's words joined, or null (and its unknown words noted) when one is unknown. */
	const phrase = (text: string): string | null => {
		const words = spokenWords(text);
		if (!words.length) return null;
		const bad = words.filter((w) => pron(w) === null);
		if (bad.length) {
			for (const b of bad) missing.add(b);
			return null;
		}
		return words.join(' ');
	};
	const keep = (list: Iterable<string>): Set<string> => {
		const out = new Set<string>();
		for (const t of list) {
			const p = phrase(t);
			if (p) out.add(p);
		}
		return out;
	};

	// Steps that take a value are followed by a number and the unit words of their own kinds of
	// quantity (less the alike-sounding unit of another scale, unless a step of the job is in it);
	// check steps by no value at all. Two groups, not one a unit: the decoder expands every use
	// of <number> into a copy of its own, and one group a unit doubled the decode time (CPU p50
	// 198 → 367 ms a phrase on job 1041). Step and part names still make one list for "spec …",
	// "done …" and "new …" (the phrase engine, not the grammar, tells a step from a part).
	// A fill's grade may follow its unit: the units of fills with a fluid spec are a list of
	// their own, in the same group (a third group, with its own copy of <number>, cost 55 % more
	// decode CPU: p50 210 → 326 ms on job 1041; a grade after every unit 45 %; this way, with
	// each grade family said once, about 5 %: p50 229 → 240 ms).
	const groups = new Map<string, { names: Set<string>; units: Set<string>; value: boolean }>();
	const jobUnits = input.steps.flatMap((s) => (s.unit ? [s.unit] : []));
	const families = Object.entries(
		gradeFamilies(input.steps.flatMap((s) => (s.unit && s.fluid ? [s.fluid] : [])))
	)
		.map(([name, list]) => [name, keep(list)] as const)
		.filter(([, list]) => list.size);
	const grades = families.length > 0;
	const fillUnits = keep(
		input.steps.flatMap((s) => (s.unit && s.fluid ? stepUnitPhrases(s, jobUnits) : []))
	);
	for (const s of input.steps) {
		const key = s.unit ? 'value' : 'check';
		const g = groups.get(key) ?? { names: new Set<string>(), units: new Set(), value: !!s.unit };
		for (const u of keep(stepUnitPhrases(s, jobUnits))) g.units.add(u);
		for (const n of keep([s.label, ...(s.aliases ?? [])])) g.names.add(n);
		if (g.names.size) groups.set(key, g);
	}
	const steps = new Set([...groups.values()].flatMap((g) => [...g.names]));
	const names = keep([...steps, ...(input.parts ?? [])]);
	const partsOnly = [...keep(input.parts ?? [])].filter((p) => !steps.has(p));
	const noteWords = new Set<string>();
	for (const p of [...names, ...NOTE_WORDS]) {
		for (const w of p.split(' ')) if (pron(w)) noteWords.add(w);
	}
	for (const w of [...ONES, ...TEENS, ...TENS.filter(Boolean), 'hundred', 'and', 'point', 'oh']) {
		pron(w);
	}
	/**
	 * A rule, or null when nothing in it can be said: an empty list is left out rather than
	 * written as <VOID>, which in a trial with soundswallower 0.6.3 silenced a whole grammar.
	 */
	const rule = (name: string, list: Iterable<string>): string | null => {
		const body = alternatives(list);
		return body ? `<${name}> = ${body};` : null;
	};

	const groupRules: string[] = [];
	const calls: string[] = [];
	for (const [key, g] of groups) {
		// a step with no unit is a check: it is done, never given a value
		// a grade only after the unit: "one point one five w thirty" would read as 1.15
		const fill = key === 'value' && grades ? fillUnits : new Set<string>();
		const other = [...g.units].filter((u) => !fill.has(u));
		const unit = !g.units.size
			? ''
			: !fill.size
				? ` [<${key}unit>]`
				: other.length
					? ` [<${key}unit> | <fillunit> [<grade>]]`
					: ` [<fillunit> [<grade>]]`;
		const value = g.value ? `<number>${unit} | ` : '';
		calls.push(`<${key}name> (${value}<donetail> | <parttail>)`);
		groupRules.push(`<${key}name> = ${alternatives(g.names)};`);
		if (other.length) groupRules.push(`<${key}unit> = ${alternatives(other)};`);
		if (fill.size) groupRules.push(`<fillunit> = ${alternatives(fill)};`);
	}
	if (grades) {
		// each family once, in the order a spec is written: SAE, API, JASO; or a brake fluid class
		const oil = families.filter(([n]) => n !== 'dot').map(([n]) => n);
		const orders = oil.map((n, i) =>
			[`<${n}>`, ...oil.slice(i + 1).map((m) => `[<${m}>]`)].join(' ')
		);
		if (families.some(([n]) => n === 'dot')) orders.push('<dot>');
		groupRules.push(`<grade> = ${orders.join(' | ')};`);
		for (const [n, list] of families) groupRules.push(`<${n}> = ${alternatives(list)};`);
	}
	if (partsOnly.length) {
		calls.push('<partname> <parttail>');
		groupRules.push(`<partname> = ${alternatives(partsOnly)};`);
	}
	if (names.size) calls.push('<prefix> <name>');
	calls.push('note <noteword>+', '<next>', '<undo>', '<cancel>');
	const garbage = input.garbage ?? GARBAGE_WEIGHT;
	if (garbage > 0) for (const ph of PHONES) added.push([GARBAGE_PREFIX + ph.toLowerCase(), ph]);
	const lines = [
		'#JSGF V1.0;',
		'grammar benchcall;',
		...(garbage > 0
			? [
					`public <top> = /1/ <call> | /${garbage}/ <garbage>;`,
					`<call> = ${calls.join(' | ')};`,
					`<garbage> = (${PHONES.map((p) => GARBAGE_PREFIX + p.toLowerCase()).join(' | ')})+;`
				]
			: [`public <call> = ${calls.join(' | ')};`]),
		rule('prefix', keep([...SPEC_PREFIX, ...HISTORY_PREFIX, ...DONE_PREFIX, ...PART_PREFIX])),
		rule('next', keep(NEXT)),
		rule('undo', keep(UNDO)),
		rule('cancel', keep(CANCEL)),
		rule('donetail', keep(DONE_SUFFIX)),
		rule('parttail', keep(PART_SUFFIX)),
		rule('noteword', noteWords),
		// "point one one" as well as "zero point one one": clearances are said both ways
		'<number> = <whole> [<decimals>] | <decimals>;',
		'<decimals> = point <digit> [<digit> [<digit>]];',
		// up to 999, plus the way shops say revs: "fourteen hundred", "one thousand five hundred"
		'<whole> = zero | <below100> [(hundred | thousand [<one> hundred]) [[and] <below100>]];',
		'<below100> = <one> | <teen> | <tens> [<one>];',
		`<digit> = zero | oh | ${ONES.slice(1).join(' | ')};`,
		`<one> = ${ONES.slice(1).join(' | ')};`,
		`<teen> = ${TEENS.join(' | ')};`,
		`<tens> = ${TENS.filter(Boolean).join(' | ')};`,
		rule('name', names),
		...groupRules
	].filter((l): l is string => l !== null);

	const words = [...prons.entries()].filter(([, p]) => p !== null).map(([w]) => w);
	return {
		jsgf: lines.join('\n') + '\n',
		words: words.sort(),
		added,
		missing: [...missing].sort()
	};
}
