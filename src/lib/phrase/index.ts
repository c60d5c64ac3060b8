/**
 * The phrase engine: what a technician calls out at the bench ("swingarm pivot 8.5 kgf m",
 * "oil 1.1 L filled", "new drain plug washer", "spec fork fluid") read into an intent, the
 * matched step, the value converted into the step's unit and a verdict against its spec.
 * Pure TypeScript: the same code gives the call bar's instant preview in the browser and the
 * authoritative verdict on the server. Never throws.
 */
import { safeParse } from './parse';
import type { ParsedPhrase, PhraseContext, PhraseParser, StepSpec } from './types';
import { buildVocabulary, vocabularyFor, type Vocabulary } from './vocabulary';

export { wordsToNumber, findNumbers, readNumberAt } from './numbers';
export { MAX_PHRASE_CHARS } from './text';
export { fluidJudgement, stepFluidSpec } from './fluid';
export type {
	FluidVerdict,
	Intent,
	ParsedPhrase,
	PhraseContext,
	PhraseParser,
	SpecBand,
	StepSpec,
	Verdict
} from './types';
export { DEFAULT_TOLERANCE_PCT, judge, type Judgement } from './judge';
export { MATCH_THRESHOLD } from './pick';
export { isCancel } from './intents';
export { formatSpec, readBack, verdictWords } from './readback';

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
