/**
 * The value in a phrase: which number it is (the last one followed by a unit, by filler words,
 * or by an unknown word in the unit's place), its unit, and the measurement it makes against
 * the step of the same kind.
 */
import { dimensionOf, formatQuantity, unitFromWords, unitInfo } from '../units/index';
import { judge } from './judge';
import { FILLER_WORDS } from './similarity';
import type { NumberSpan } from './numbers';
import { pickStep, quote, stepLabel } from './pick';
import { emptyResult, type ParsedPhrase, type PhraseContext, type StepSpec } from './types';
import type { Vocabulary } from './vocabulary';

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
export function unitAfter(tokens: string[], i: number): { unit: string; end: number } | null {
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
export function chooseValue(
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

/** Reads `span` as the value of a measurement, picks its step and judges it; sets `r`. */
export function measure(
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
		const probe = emptyResult();
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
