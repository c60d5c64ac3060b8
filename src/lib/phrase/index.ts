/**
 * The phrase engine: what a technician calls out at the bench ("swingarm pivot 8.5 kgf m",
 * "oil 1.1 L filled", "new drain plug washer", "spec fork fluid") read into an intent, the
 * matched step, the value converted into the step's unit and a verdict against its spec.
 * Pure TypeScript: the same code gives the call bar's instant preview in the browser and the
 * authoritative verdict on the server. Never throws.
 */
import {
	convert,
	dimensionOf,
	formatNumber,
	formatQuantity,
	unitFromWords,
	unitInfo
} from '../units/index';
import { FILLER_WORDS, StepIndex, toMatchTokens, type ScoredStep } from './match';
import { extractGrade, fluidJudgement } from './fluid';
import { extractAdapter } from './adapter';
import type { Adapter } from '../torque/adapter';
import { findNumbers, type NumberSpan } from './numbers';
import { numbersInNames, readPair } from './pairs';
import { MAX_PHRASE_CHARS, normalizeText, tokenize } from './text';
import { historyWords } from './history';
import { defaultTimeZone, extractTime } from './time';

export { wordsToNumber, findNumbers, readNumberAt } from './numbers';
export { MAX_PHRASE_CHARS } from './text';
export { fluidJudgement, stepFluidSpec } from './fluid';

export interface StepSpec {
	id: string;
	label: string;
	aliases?: string[];
	unit?: string;
	nominal?: number;
	min?: number;
	max?: number;
	done?: boolean;
	/** The fluid spec as the manual writes it: "SAE 10W-30, API SJ or higher, JASO MA", "DOT 4". */
	fluid?: string;
}

export interface PhraseContext {
	steps: StepSpec[];
	now?: Date;
	/** IANA zone of the shop, e.g. 'Europe/Berlin'; defaults to the runtime's zone. */
	timeZone?: string;
	/** Shop policy band for a spec that gives only a nominal value, in percent (default 10). */
	tolerancePct?: number;
}

export type Intent =
	'measure' | 'part' | 'note' | 'next' | 'spec' | 'history' | 'done' | 'undo' | 'unknown';
export type Verdict = 'in' | 'low' | 'high' | 'no_spec';
export type { FluidVerdict } from './fluid';
import type { FluidVerdict } from './fluid';

/** The limits a value was judged against, in the step's unit. */
export interface SpecBand {
	min: number | null;
	max: number | null;
	/** 'spec': the step's own min/max; 'shop_tolerance': nominal ± tolerancePct. */
	source: 'spec' | 'shop_tolerance';
}

export interface ParsedPhrase {
	intent: Intent;
	/** The matched step. */
	stepId: string | null;
	/** Best first (score 0..1, higher is better). */
	candidates: { stepId: string; score: number }[];
	/** As called out, UCUM unit ('1' when neither the phrase nor the step has one). */
	quantity: { value: number; unit: string } | null;
	/** Converted into the step's unit. */
	specValue: { value: number; unit: string } | null;
	verdict: Verdict | null;
	/** ISO 8601 when the phrase names a time. */
	occurredAt: string | null;
	/** The note's text for 'note'; what was fitted for 'part'. */
	note: string | null;
	/** Clear, human messages. */
	problems: string[];
	/** True when no unit was said and the step's own unit was assumed. */
	unitAssumed: boolean;
	/** The band behind the verdict, or null when there is no verdict or no spec. */
	band: SpecBand | null;
	/** The fluid grade as called out, normalised ("SAE 10W-30 · API SN · JASO MA2"), or null. */
	fluid: string | null;
	/**
	 * The grade against the step's fluid spec: null when the step has none; 'not_stated' when
	 * no grade was said; 'fails' when any stated part fails it; 'meets' when every one meets it.
	 */
	fluidVerdict: FluidVerdict | null;
	/** An adapter on the torque wrench, as said ("adapter 50 mm", "crowfoot at 90"), or null. */
	adapter: Adapter | null;
}

export interface PhraseParser {
	readonly steps: StepSpec[];
	parse(text: string, ctx?: Omit<PhraseContext, 'steps'>): ParsedPhrase;
}

export const DEFAULT_TOLERANCE_PCT = 10;
/** Lowest match score that names a step. */
export const MATCH_THRESHOLD = 0.55;
/** Two steps closer than this are ambiguous: Benchcall asks rather than guesses. */
const AMBIGUITY_MARGIN = 0.03;
const MAX_CANDIDATES = 5;
const MAX_STEPS = 20_000;

// --- intent words ---------------------------------------------------------------------------

const UNDO_PHRASES = new Set([
	'undo',
	'undo that',
	'undo it',
	'undo last',
	'undo the last',
	'undo last entry',
	'undo the last entry',
	'undo my last entry',
	'scratch that',
	'take that back'
]);
const NEXT_PHRASES = new Set([
	'next',
	'next step',
	'next one',
	'whats next',
	'what is next',
	'what next',
	'what now',
	'whats the next step',
	'what is the next step',
	'show next',
	'show next step',
	'show the next step'
]);
const CANCEL_PHRASES = new Set([
	'cancel',
	'cancel that',
	'cancel it',
	'cancel this',
	'cancel entry',
	'cancel the entry',
	'no cancel',
	'abort',
	'never mind',
	'nevermind',
	'dont log that',
	'do not log that'
]);
// Longest first, so "whats the spec for" wins over "spec".
const SPEC_PREFIXES = [
	'whats the torque spec for',
	'what is the torque spec for',
	'whats the spec for',
	'what is the spec for',
	'whats the spec of',
	'what is the spec of',
	'whats the spec on',
	'what is the spec on',
	'whats the torque for',
	'what is the torque for',
	'show the spec for',
	'show me the spec for',
	'show spec for',
	'whats the spec',
	'what is the spec',
	'what spec for',
	'what spec',
	'specs for',
	'spec for',
	'spec of',
	'show spec',
	'specs',
	'spec'
].map((p) => p.split(' '));
const SPEC_SUFFIXES = [['spec'], ['specs'], ['spec', 'please']];
const PART_PREFIXES = [
	'fitted a new',
	'fitted new',
	'installed a new',
	'installed new',
	'put in a new',
	'put in new',
	'changed the',
	'replaced the',
	'renewed the',
	'a new',
	'new',
	'replaced',
	'renewed',
	'replace',
	'renew',
	'changed',
	'fitted',
	'installed'
].map((p) => p.split(' '));
const PART_SUFFIXES = [['replaced'], ['renewed'], ['changed'], ['fitted'], ['installed']];
const DONE_PREFIXES = ['mark done', 'done with', 'done', 'finished', 'completed', 'complete'].map(
	(p) => p.split(' ')
);
const DONE_SUFFIXES = [
	['done'],
	['ok'],
	['okay'],
	['checked'],
	['checked', 'ok'],
	['passed'],
	['complete'],
	['completed'],
	['finished'],
	['good']
];
const NOTE_RE = /^\s*(?:add\s+(?:a\s+)?)?notes?\b[\s:,.;-]*([\s\S]*)$/i;

function startsWith(tokens: string[], prefixes: string[][]): number {
	for (const p of prefixes) {
		if (p.length <= tokens.length && p.every((w, i) => tokens[i] === w)) return p.length;
	}
	return 0;
}

function endsWith(tokens: string[], suffixes: string[][]): number {
	let best = 0;
	for (const s of suffixes) {
		const off = tokens.length - s.length;
		if (off >= 1 && s.every((w, i) => tokens[off + i] === w)) best = Math.max(best, s.length);
	}
	return best;
}

// --- index per vocabulary -------------------------------------------------------------------

interface Vocabulary {
	steps: StepSpec[];
	index: StepIndex;
	/** Numbers that are part of a step's name, built on first use. */
	numberNames?: Set<string>;
	/** Steps by id (the first of a repeated id), built on first use. */
	byId?: Map<string, StepSpec>;
}

function numberNamesOf(v: Vocabulary): Set<string> {
	v.numberNames ??= numbersInNames(v.steps);
	return v.numberNames;
}

/** The step with this id: the object itself, so `done`, units and limits are read live. */
function stepById(v: Vocabulary, id: string | null): StepSpec | undefined {
	if (id === null) return undefined;
	if (!v.byId) {
		v.byId = new Map();
		for (const s of v.steps) if (!v.byId.has(String(s.id))) v.byId.set(String(s.id), s);
	}
	return v.byId.get(id);
}

const CACHE = new WeakMap<object, Vocabulary>();

function safeSteps(steps: unknown): StepSpec[] {
	if (!Array.isArray(steps)) return [];
	return (steps as unknown[])
		.slice(0, MAX_STEPS)
		.filter(
			(s): s is StepSpec =>
				typeof s === 'object' &&
				s !== null &&
				(typeof (s as StepSpec).id === 'string' || typeof (s as StepSpec).id === 'number')
		);
}

function buildVocabulary(raw: unknown): Vocabulary {
	const steps = safeSteps(raw);
	const index = new StepIndex(
		steps.map((s) => ({
			label: typeof s.label === 'string' ? s.label : String(s.id ?? ''),
			aliases: Array.isArray(s.aliases) ? s.aliases.filter((a) => typeof a === 'string') : []
		}))
	);
	return { steps, index };
}

function vocabularyFor(steps: StepSpec[]): Vocabulary {
	if (!Array.isArray(steps)) return buildVocabulary([]);
	let v = CACHE.get(steps);
	if (!v) {
		v = buildVocabulary(steps);
		CACHE.set(steps, v);
	}
	return v;
}

/**
 * A parser bound to one vocabulary, for callers that keep it (the call bar, the bench script).
 * Treat `steps` as fixed: labels and aliases are indexed once; `done`, units and limits are read
 * live at each parse.
 */
export function createPhraseParser(steps: StepSpec[]): PhraseParser {
	const vocabulary = vocabularyFor(steps);
	return {
		steps,
		parse: (text, ctx = {}) => safeParse(text, { ...ctx, steps }, vocabulary)
	};
}

/**
 * Reads one called-out phrase against the steps of a job. The search index is built once per
 * steps array (cached by identity), so pass the same array while the vocabulary is unchanged.
 * Never throws: bad input gives intent 'unknown' with a problem message.
 */
export function parsePhrase(text: string, ctx: PhraseContext): ParsedPhrase {
	let vocabulary: Vocabulary;
	try {
		vocabulary = vocabularyFor(ctx?.steps);
	} catch {
		vocabulary = buildVocabulary([]);
	}
	return safeParse(text, ctx ?? { steps: [] }, vocabulary);
}

/** True when the phrase cancels a pending voice entry ("cancel", "cancel that", "never mind"). */
export function isCancel(text: string): boolean {
	if (typeof text !== 'string' || text.length > 60) return false;
	return CANCEL_PHRASES.has(tokenize(normalizeText(text)).join(' '));
}

// --- the parse ------------------------------------------------------------------------------

function empty(): ParsedPhrase {
	return {
		intent: 'unknown',
		stepId: null,
		candidates: [],
		quantity: null,
		specValue: null,
		verdict: null,
		occurredAt: null,
		note: null,
		problems: [],
		unitAssumed: false,
		band: null,
		fluid: null,
		fluidVerdict: null,
		adapter: null
	};
}

function safeParse(text: unknown, ctx: PhraseContext, vocabulary: Vocabulary): ParsedPhrase {
	try {
		return parse(text, ctx, vocabulary);
	} catch (e) {
		const r = empty();
		r.problems.push(
			'Benchcall could not read that phrase' +
				(e instanceof Error && e.message ? ` (${e.message.slice(0, 120)}).` : '.')
		);
		return r;
	}
}

function stepLabel(step: StepSpec | undefined): string {
	return step && typeof step.label === 'string' && step.label ? step.label : 'that step';
}

function quote(s: string): string {
	const t = s.length > 60 ? s.slice(0, 57) + '…' : s;
	return `"${t}"`;
}

function parse(text: unknown, ctx: PhraseContext, vocabulary: Vocabulary): ParsedPhrase {
	const r = empty();
	const { steps, index } = vocabulary;
	if (typeof text !== 'string') {
		r.problems.push('Nothing to read: the phrase is not text.');
		return r;
	}
	let raw = text;
	if (raw.length > MAX_PHRASE_CHARS) {
		raw = raw.slice(0, MAX_PHRASE_CHARS);
		r.problems.push(`Only the first ${MAX_PHRASE_CHARS} characters were read.`);
	}
	if (raw.trim() === '') {
		r.problems.push('Nothing heard. Call out a step and a value, e.g. "rear axle 80 Nm".');
		return r;
	}

	// note: keep the technician's own words and case
	const noteMatch = NOTE_RE.exec(raw.normalize('NFKC'));
	if (noteMatch) {
		r.intent = 'note';
		const body = (noteMatch[1] ?? '').replace(/\s+/g, ' ').trim();
		if (body) r.note = body;
		else r.problems.push('Say what to note after "note", e.g. "note left fork seal weeping".');
		return r;
	}

	const now = ctx.now instanceof Date && !Number.isNaN(ctx.now.getTime()) ? ctx.now : new Date();
	if (ctx.now !== undefined && now !== ctx.now) {
		r.problems.push('The reference time was not a valid date; the current time was used.');
	}
	const timeZone =
		typeof ctx.timeZone === 'string' && ctx.timeZone ? ctx.timeZone : defaultTimeZone();

	const normalized = normalizeText(raw);
	const time = extractTime(normalized, now, timeZone);
	r.problems.push(...time.problems);
	const said = extractGrade(tokenize(time.rest));
	r.fluid = said.text;
	r.problems.push(...said.problems);
	const fitted = extractAdapter(said.rest);
	const tokens = fitted.rest;
	r.adapter = fitted.adapter;
	r.problems.push(...fitted.problems);
	const joined = tokens.join(' ');

	if (UNDO_PHRASES.has(joined)) {
		r.intent = 'undo';
		return r;
	}
	if (NEXT_PHRASES.has(joined)) {
		r.intent = 'next';
		const next = steps.find((s) => !s.done);
		if (next) r.stepId = String(next.id);
		else r.problems.push(steps.length ? 'Every step is done.' : 'This job has no steps.');
		return r;
	}
	if (CANCEL_PHRASES.has(joined)) {
		r.problems.push('"Cancel" stops a pending voice entry; there is nothing to log.');
		return r;
	}
	r.occurredAt = time.occurredAt;

	// spec: "spec fork fluid", "what's the spec for the fork oil", "fork oil spec"
	const specPre = startsWith(tokens, SPEC_PREFIXES);
	const specSuf = specPre ? 0 : endsWith(tokens, SPEC_SUFFIXES);
	if (specPre || specSuf) {
		r.intent = 'spec';
		r.occurredAt = null;
		const words = tokens.slice(specPre, tokens.length - specSuf);
		pickStep(r, words, vocabulary, null, 'spec');
		return r;
	}

	// history: "history rear axle", "rear axle history", "past readings for the chain slack"
	// (never a phrase with a value in it, nor one that starts as a part or a step done)
	const historyOf =
		startsWith(tokens, PART_PREFIXES) || startsWith(tokens, DONE_PREFIXES)
			? null
			: historyWords(tokens);
	if (historyOf && findNumbers(historyOf).length === 0) {
		r.intent = 'history';
		r.occurredAt = null;
		pickStep(r, historyOf, vocabulary, null, 'history');
		return r;
	}

	// part: "new drain plug washer", "replaced the air filter", "spark plugs replaced"
	const partPre = startsWith(tokens, PART_PREFIXES);
	const partSuf = partPre ? 0 : endsWith(tokens, PART_SUFFIXES);
	if (partPre || partSuf) {
		const words = tokens.slice(partPre, tokens.length - partSuf);
		r.intent = 'part';
		if (words.length === 0) {
			r.problems.push('Say which part was fitted, e.g. "new drain plug washer".');
			return r;
		}
		r.note = words.join(' ');
		pickStep(r, words, vocabulary, null, 'part');
		return r;
	}

	// done: "done test ride", "rear brake light checked ok" — unless a value follows, as in
	// "done chain slack 30 mm", which is a measure
	const donePre = startsWith(tokens, DONE_PREFIXES);
	const doneSuf = donePre ? 0 : endsWith(tokens, DONE_SUFFIXES);
	const body = donePre ? tokens.slice(donePre) : tokens;
	const spans = findNumbers(body);
	let value = chooseValue(body, spans, vocabulary);
	const pair = value
		? readPair(body, spans, value, unitAfter(body, value.end)?.unit ?? null, (d) =>
				numberNamesOf(vocabulary).has(d)
			)
		: null;
	if (pair?.kind === 'pair') value = pair.span;
	if (pair?.kind === 'ask') {
		r.problems.push(pair.problem);
		return r;
	}
	if ((donePre || doneSuf) && !value) {
		r.intent = 'done';
		const words = tokens.slice(donePre, tokens.length - doneSuf);
		if (words.length === 0) {
			r.problems.push('Say which step is done, e.g. "done test ride".');
			return r;
		}
		pickStep(r, words, vocabulary, null, 'done');
		judgeFluid(r, vocabulary, said.problems.length);
		return r;
	}

	// measure: "<step words> <number> [unit]"
	if (!value) {
		r.intent = 'unknown';
		const words = toMatchTokens(body);
		const hits = index.search(words).filter((h) => h.score >= MATCH_THRESHOLD);
		r.candidates = toCandidates(hits, steps);
		const best = hits[0] ? steps[hits[0].index] : undefined;
		if (best) {
			r.problems.push(
				`No value heard for ${stepLabel(best)}. Say a number, e.g. "${stepLabel(best).toLowerCase()} ${exampleValue(best)}", or "done ${stepLabel(best).toLowerCase()}".`
			);
		} else {
			r.problems.push(
				`Benchcall could not match ${quote(tokens.join(' ') || raw.trim())} to a step of this job. ` +
					'Call out a step and a value ("rear axle 80 Nm"), or start with "note", "new", "spec", "done", "next" or "undo".'
			);
		}
		return r;
	}
	measure(r, body, value, vocabulary, ctx);
	judgeFluid(r, vocabulary, said.problems.length);
	return r;
}

/** Sets fluidVerdict (and why it fails, its caution, or the prompt) for the matched step. */
function judgeFluid(r: ParsedPhrase, vocabulary: Vocabulary, saidProblems: number): void {
	const step = stepById(vocabulary, r.stepId);
	const j = step ? fluidJudgement(step, r.fluid) : null;
	r.fluidVerdict = j ? j.verdict : null;
	// an unknown grade's problem was said when it was read
	if (j && saidProblems === 0) r.problems.push(...j.problems);
}

function exampleValue(step: StepSpec): string {
	const v = step.nominal ?? step.min ?? step.max;
	if (typeof v !== 'number' || !Number.isFinite(v)) return '…';
	return step.unit && unitInfo(step.unit) ? formatQuantity(v, step.unit) : String(v);
}

function toCandidates(hits: ScoredStep[], steps: StepSpec[]): ParsedPhrase['candidates'] {
	return hits.slice(0, MAX_CANDIDATES).map((h) => ({
		stepId: String(steps[h.index]?.id ?? ''),
		score: h.score
	}));
}

/** Picks the step that the words name among steps allowed by `accept`; sets problems. */
function pickStep(
	r: ParsedPhrase,
	tokens: string[],
	vocabulary: Vocabulary,
	accept: ((step: StepSpec) => boolean) | null,
	purpose: 'spec' | 'history' | 'part' | 'done' | 'measure'
): StepSpec | null {
	const { steps, index } = vocabulary;
	const words = toMatchTokens(tokens);
	if (words.length === 0) {
		if (purpose !== 'part') r.problems.push(whichStep(purpose));
		return null;
	}
	const hits = index
		.search(words, (i) => {
			const s = steps[i];
			return s !== undefined && (accept === null || accept(s));
		})
		.filter((h) => h.score >= MATCH_THRESHOLD);
	r.candidates = toCandidates(hits, steps);
	const [first, second] = hits;
	if (!first) {
		if (purpose === 'part') return null; // a part need not belong to a step
		if (steps.length === 0) r.problems.push('This job has no steps to match.');
		else r.problems.push(`No step of this job matches ${quote(tokens.join(' '))}.`);
		return null;
	}
	if (second && first.score - second.score < AMBIGUITY_MARGIN) {
		const tied = hits
			.filter((h) => first.score - h.score < AMBIGUITY_MARGIN)
			.slice(0, 3)
			.map((h) => stepLabel(steps[h.index]));
		r.problems.push(
			`${quote(tokens.join(' '))} fits more than one step: ${tied.join(', ')}. Say which.`
		);
		return null;
	}
	const step = steps[first.index] ?? null;
	r.stepId = step ? String(step.id) : null;
	return step;
}

function whichStep(purpose: 'spec' | 'history' | 'done' | 'measure' | 'part'): string {
	if (purpose === 'spec') return 'Which step? e.g. "spec rear axle".';
	if (purpose === 'history') return 'Which step? e.g. "history rear axle".';
	if (purpose === 'done') return 'Which step is done? e.g. "done test ride".';
	return 'Which step? Say its name with the value, e.g. "rear axle 80 Nm".';
}

/** Words that follow a value, not a name: "1.1 in the sump", "120 each side". */
const VALUE_THEN = new Set([
	'in',
	'into',
	'on',
	'at',
	'for',
	'each',
	'per',
	'both',
	'all',
	'after'
]);
const DEGREE_WORDS = new Set(['degrees', 'degree', 'deg', '°']);
const GLUE_WORDS = new Set(['the', 'a', 'an', 'of', 'and']);
const AFTER_VALUE_FILLERS = new Set(['done', 'ok', 'okay', 'filled', 'added', 'set']);

const UNIT_WORDS = new Map<string, string | null>();

/** unitFromWords, remembered: the unit table is fixed, and a phrase asks up to 7 × 3 times. */
function unitOfWords(words: string): string | null {
	let code = UNIT_WORDS.get(words);
	if (code === undefined) {
		code = unitFromWords(words);
		if (UNIT_WORDS.size >= 4000) UNIT_WORDS.clear();
		UNIT_WORDS.set(words, code);
	}
	return code;
}

/** The unit named by the words starting at token i (longest first), or null. */
function unitAfter(tokens: string[], i: number): { unit: string; end: number } | null {
	for (let k = Math.min(7, tokens.length - i); k >= 1; k--) {
		const last = tokens[i + k - 1] ?? '';
		const next = tokens[i + k];
		// "in" is the inch only where it cannot be the preposition ("1.1 in the sump")
		if (k === 1 && last === 'in' && next !== undefined && /^[a-z]/.test(next)) continue;
		if (GLUE_WORDS.has(last)) continue;
		const code = unitOfWords(k === 1 ? last : tokens.slice(i, i + k).join(' '));
		if (code) return { unit: code, end: i + k };
	}
	return null;
}

/**
 * The number that is the value: the last one followed by a unit, by nothing but filler words,
 * or by an unknown word in the unit's place. A number followed by more of a step's name
 * ("cylinder 2 intake valve clearance") is part of the name, not a value.
 */
function chooseValue(
	tokens: string[],
	spans: NumberSpan[],
	vocabulary: Vocabulary
): NumberSpan | null {
	for (let k = spans.length - 1; k >= 0; k--) {
		const span = spans[k] as NumberSpan;
		if (unitAfter(tokens, span.end)) return span;
		const rest = tokens.slice(span.end);
		if (rest.every((t) => FILLER_WORDS.has(t) || AFTER_VALUE_FILLERS.has(t) || GLUE_WORDS.has(t))) {
			return span;
		}
		const next = rest[0];
		if (next !== undefined && (VALUE_THEN.has(next) || DEGREE_WORDS.has(next))) return span;
		if (next !== undefined && /^[a-zµμω°"]/.test(next) && looksLikeUnit(next, vocabulary)) {
			return span;
		}
	}
	return null;
}

function measure(
	r: ParsedPhrase,
	tokens: string[],
	span: NumberSpan,
	vocabulary: Vocabulary,
	ctx: PhraseContext
): void {
	r.intent = 'measure';
	const found = unitAfter(tokens, span.end);
	let unit: string | null = found?.unit ?? null;
	const unitEnd = found?.end ?? span.end;

	const stepTokens = [...tokens.slice(0, span.start), ...tokens.slice(unitEnd)].filter(
		(t, i, all) => !(i === all.length - 1 && AFTER_VALUE_FILLERS.has(t))
	);

	// "90 degrees": a temperature in the step's own scale (°C or °F), never an angle
	if (!unit && DEGREE_WORDS.has(tokens[span.end] ?? '')) {
		const words = stepTokens.filter((t, i) => !(i === span.start && DEGREE_WORDS.has(t)));
		const hot = pickStep(
			r,
			words,
			vocabulary,
			(st) => dimensionOf(st.unit ?? '') === 'temperature',
			'measure'
		);
		if (!hot || !hot.unit) {
			if (!hot) r.problems.push('"Degrees" alone is not a unit here: say degrees C or degrees F.');
			return;
		}
		r.unitAssumed = true;
		r.quantity = { value: span.value, unit: hot.unit };
		const judged = judge(span.value, hot.unit, hot, ctx.tolerancePct);
		r.specValue = judged.specValue;
		r.verdict = judged.verdict;
		r.band = judged.band;
		r.problems.push(...judged.problems);
		return;
	}

	// a word right after the number that is neither a unit nor part of any step name
	if (!unit) {
		const after = tokens[span.end];
		if (after !== undefined && /^[a-zµμω°"]/.test(after) && looksLikeUnit(after, vocabulary)) {
			r.problems.push(
				`${quote(after)} is not a unit Benchcall knows. Say e.g. N·m, kgf·m, lbf·ft, mL, L, mm, psi, bar, kPa, V, rpm or °C.`
			);
			pickStep(
				r,
				stepTokens.filter((t) => t !== after),
				vocabulary,
				null,
				'measure'
			);
			return;
		}
	}

	const dim = unit ? dimensionOf(unit) : null;
	const sameKind = (s: StepSpec) =>
		!dim || (typeof s.unit === 'string' && dimensionOf(s.unit) === dim);
	const step = pickStep(r, stepTokens, vocabulary, sameKind, 'measure');

	if (!step && dim && r.candidates.length === 0) {
		// nothing of this kind matches: is there a step of another kind with these words?
		const probe = empty();
		const other = pickStep(probe, stepTokens, vocabulary, null, 'measure');
		if (other) {
			r.stepId = probe.stepId;
			r.candidates = probe.candidates;
			r.problems.splice(
				0,
				r.problems.length,
				...r.problems.filter((p) => !p.startsWith('No step'))
			);
			const otherDim = typeof other.unit === 'string' ? dimensionOf(other.unit) : null;
			r.quantity = { value: span.value, unit: unit as string };
			r.problems.push(
				otherDim
					? `${stepLabel(other)} is measured in ${unitInfo(other.unit as string)?.symbol} (${otherDim}); ${formatQuantity(span.value, unit as string)} is a ${dim}.`
					: `${stepLabel(other)} has no unit to compare ${formatQuantity(span.value, unit as string)} with.`
			);
			r.verdict = otherDim ? null : 'no_spec';
			return;
		}
	}
	if (!step) {
		if (unit) r.quantity = { value: span.value, unit };
		return;
	}

	const stepUnit = typeof step.unit === 'string' && step.unit ? step.unit : null;
	const stepUnitKnown = stepUnit !== null && unitInfo(stepUnit) !== undefined;
	if (stepUnit && !stepUnitKnown) {
		r.problems.push(
			`${stepLabel(step)} has the unit '${stepUnit}', which Benchcall does not know.`
		);
	}
	if (!unit) {
		r.unitAssumed = true;
		unit = stepUnit ?? '1';
	}
	r.quantity = { value: span.value, unit };
	if (!stepUnit || !stepUnitKnown || unit === '1' || !unitInfo(unit)) {
		r.verdict = 'no_spec';
		return;
	}
	const judged = judge(span.value, unit, step, ctx.tolerancePct);
	r.specValue = judged.specValue;
	r.verdict = judged.verdict;
	r.band = judged.band;
	r.problems.push(...judged.problems);
}

/** A short word that is in no step name and is not a number word: probably a misheard unit. */
function looksLikeUnit(word: string, vocabulary: Vocabulary): boolean {
	if (word.length > 12) return false;
	const sims = vocabulary.index.similar(word);
	return (
		sims.size === 0 &&
		!AFTER_VALUE_FILLERS.has(word) &&
		!FILLER_WORDS.has(word) &&
		!GLUE_WORDS.has(word) &&
		!/^\d/.test(word)
	);
}

// --- the verdict ----------------------------------------------------------------------------

export interface Judgement {
	specValue: { value: number; unit: string } | null;
	verdict: Verdict | null;
	band: SpecBand | null;
	problems: string[];
}

const finite = (x: unknown): x is number => typeof x === 'number' && Number.isFinite(x);

/** Float slack at a bound: 950 mL against 0.95 L is in, however the product rounds. */
function slack(bound: number): number {
	return Math.abs(bound) * 1e-9 + 1e-12;
}

/**
 * Judges a value against a step's spec, in the step's own unit: min and max inclusive; with
 * only a nominal, nominal ± tolerancePct (shop policy, default 10 %); neither, or no unit on the
 * step: 'no_spec'. A unit of another kind gives no verdict and a problem. Never throws.
 */
export function judge(
	value: number,
	unit: string,
	step: Pick<StepSpec, 'label' | 'unit' | 'nominal' | 'min' | 'max'>,
	tolerancePct: number = DEFAULT_TOLERANCE_PCT
): Judgement {
	const out: Judgement = { specValue: null, verdict: null, band: null, problems: [] };
	try {
		const stepUnit = typeof step.unit === 'string' && step.unit ? step.unit : null;
		if (!finite(value)) {
			out.problems.push('The value is not a number.');
			return out;
		}
		if (!stepUnit || !unitInfo(stepUnit)) {
			out.verdict = 'no_spec';
			return out;
		}
		const from = unitInfo(unit);
		if (!from) {
			out.problems.push(`'${unit}' is not a unit Benchcall knows.`);
			return out;
		}
		if (dimensionOf(unit) !== dimensionOf(stepUnit)) {
			out.problems.push(
				`${stepLabel(step as StepSpec)} is measured in ${unitInfo(stepUnit)?.symbol} (${dimensionOf(stepUnit)}); ${formatQuantity(value, unit)} is a ${from.dimension}.`
			);
			return out;
		}
		const v = convert(value, unit, stepUnit);
		out.specValue = { value: v, unit: stepUnit };

		let min = finite(step.min) ? step.min : null;
		let max = finite(step.max) ? step.max : null;
		let source: SpecBand['source'] = 'spec';
		if (min === null && max === null) {
			if (!finite(step.nominal)) {
				out.verdict = 'no_spec';
				return out;
			}
			let pct = tolerancePct;
			if (!finite(pct) || pct < 0 || pct >= 100) {
				out.problems.push(
					`Tolerance ${String(tolerancePct)} % is not usable; the shop default ±${DEFAULT_TOLERANCE_PCT} % was used.`
				);
				pct = DEFAULT_TOLERANCE_PCT;
			}
			const n = step.nominal;
			const d = Math.abs(n) * pct;
			// computed in hundredths to keep 5.4 × 0.9 = 4.86 clean
			min = Number(((n * 100 - d) / 100).toPrecision(15));
			max = Number(((n * 100 + d) / 100).toPrecision(15));
			source = 'shop_tolerance';
		}
		if (min !== null && max !== null && min > max) {
			out.problems.push(`The spec of ${stepLabel(step as StepSpec)} has min above max.`);
			[min, max] = [max, min];
		}
		out.band = { min, max, source };
		if (min !== null && v < min - slack(min)) out.verdict = 'low';
		else if (max !== null && v > max + slack(max)) out.verdict = 'high';
		else out.verdict = 'in';
		return out;
	} catch (e) {
		out.verdict = null;
		out.problems.push(e instanceof Error ? e.message : 'The value could not be judged.');
		return out;
	}
}

// --- words for the screen and the read-back ---------------------------------------------------

const VERDICT_WORDS: Record<Verdict, string> = {
	in: 'in spec',
	low: 'under',
	high: 'over',
	no_spec: 'no spec'
};

/** The words Benchcall shows and says for a verdict: in spec, under, over, no spec. */
export function verdictWords(verdict: Verdict): string {
	return VERDICT_WORDS[verdict] ?? 'no spec';
}

/**
 * A step's spec as text: "80–90 N·m", "at least 12.4 V", "at most 1.5 mm", "5.4 kgf·m"
 * (nominal only), "no spec"; with `spoken`, for read-back ("80 to 90 newton metres").
 */
export function formatSpec(
	step: Pick<StepSpec, 'unit' | 'nominal' | 'min' | 'max'>,
	opts: { spoken?: boolean } = {}
): string {
	const unit = typeof step.unit === 'string' ? step.unit : '';
	const spoken = !!opts.spoken;
	const q = (v: number) => (unit ? formatQuantity(v, unit, { spoken }) : String(v));
	const min = finite(step.min) ? step.min : null;
	const max = finite(step.max) ? step.max : null;
	if (min !== null && max !== null) {
		return spoken ? `${formatNumber(min)} to ${q(max)}` : `${formatNumber(min)}–${q(max)}`;
	}
	if (min !== null) return `at least ${q(min)}`;
	if (max !== null) return `at most ${q(max)}`;
	if (finite(step.nominal)) return q(step.nominal);
	return 'no spec';
}

/**
 * One short sentence for the read-back after a phrase: "Rear axle nut, 80 newton metres, in
 * spec"; "New drain plug washer"; "Chain slack: spec 25 to 35 millimetres"; or the first
 * problem when there is one to say.
 */
export function readBack(parsed: ParsedPhrase, steps: StepSpec[]): string {
	try {
		const step = Array.isArray(steps)
			? steps.find((s) => s && String(s.id) === parsed.stepId)
			: undefined;
		const label = step ? stepLabel(step) : null;
		const problem = parsed.problems[0] ?? null;
		switch (parsed.intent) {
			case 'measure': {
				if (!label || !parsed.quantity || !parsed.verdict) return problem ?? 'Not logged.';
				const { value, unit } = parsed.quantity;
				const said = unitInfo(unit) ? formatQuantity(value, unit, { spoken: true }) : String(value);
				return `${label}, ${said}, ${verdictWords(parsed.verdict)}`;
			}
			case 'part':
				return parsed.note ? `New ${parsed.note}` : (problem ?? 'Which part?');
			case 'note':
				return parsed.note ? 'Note taken' : (problem ?? 'Nothing to note.');
			case 'done':
				return label ? `${label}, done` : (problem ?? 'Which step?');
			case 'spec':
				return label && step
					? `${label}: spec ${formatSpec(step, { spoken: true })}`
					: (problem ?? 'Which step?');
			case 'history':
				return label ? `${label}: past readings on this vehicle` : (problem ?? 'Which step?');
			case 'next':
				return label ? `Next: ${label}` : (problem ?? 'Nothing next.');
			case 'undo':
				return 'Undo your last entry';
			default:
				return problem ?? 'Not understood.';
		}
	} catch {
		return 'Not understood.';
	}
}
