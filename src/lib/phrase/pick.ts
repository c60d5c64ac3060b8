/**
 * Picking the step a phrase names: the best match above the threshold, unless another is as
 * good (then Benchcall asks rather than guesses). Sets the candidates and the problems.
 */
import type { ScoredStep } from './match';
import { toMatchTokens } from './similarity';
import type { ParsedPhrase, StepSpec } from './types';
import type { Vocabulary } from './vocabulary';

/** Lowest match score that names a step. */
export const MATCH_THRESHOLD = 0.55;
/** Two steps closer than this are ambiguous: Benchcall asks rather than guesses. */
const AMBIGUITY_MARGIN = 0.03;
const MAX_CANDIDATES = 5;

/** A step's label, or "that step". */
export function stepLabel(step: StepSpec | undefined): string {
	return step && typeof step.label === 'string' && step.label ? step.label : 'that step';
}

/** Said words in quotes, cut at 60 characters. */
export function quote(s: string): string {
	const t = s.length > 60 ? s.slice(0, 57) + '…' : s;
	return `"${t}"`;
}

export function toCandidates(hits: ScoredStep[], steps: StepSpec[]): ParsedPhrase['candidates'] {
	return hits.slice(0, MAX_CANDIDATES).map((h) => ({
		stepId: String(steps[h.index]?.id ?? ''),
		score: h.score
	}));
}

/** Picks the step that the words name among steps allowed by `accept`; sets problems. */
export function pickStep(
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

export function whichStep(purpose: 'spec' | 'history' | 'done' | 'measure' | 'part'): string {
	if (purpose === 'spec') return 'Which step? e.g. "spec rear axle".';
	if (purpose === 'history') return 'Which step? e.g. "history rear axle".';
	if (purpose === 'done') return 'Which step is done? e.g. "done test ride".';
	return 'Which step? Say its name with the value, e.g. "rear axle 80 Nm".';
}
