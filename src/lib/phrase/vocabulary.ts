/**
 * A job's steps as the engine reads them: cleaned of bad entries, with the match index built
 * once per steps array (cached by identity) and a few look-ups made on first use.
 */
import { StepIndex } from './match';
import { numbersInNames } from './pairs';
import type { StepSpec } from './types';

const MAX_STEPS = 20_000;

export interface Vocabulary {
	steps: StepSpec[];
	index: StepIndex;
	/** Numbers that are part of a step's name, built on first use. */
	numberNames?: Set<string>;
	/** Steps by id (the first of a repeated id), built on first use. */
	byId?: Map<string, StepSpec>;
}

/** Numbers that are part of a step's name ("caliper screw 1234"). */
export function numberNamesOf(v: Vocabulary): Set<string> {
	v.numberNames ??= numbersInNames(v.steps);
	return v.numberNames;
}

/** The step with this id: the object itself, so `done`, units and limits are read live. */
export function stepById(v: Vocabulary, id: string | null): StepSpec | undefined {
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

export function buildVocabulary(raw: unknown): Vocabulary {
	const steps = safeSteps(raw);
	const index = new StepIndex(
		steps.map((s) => ({
			label: typeof s.label === 'string' ? s.label : String(s.id ?? ''),
			aliases: Array.isArray(s.aliases) ? s.aliases.filter((a) => typeof a === 'string') : []
		}))
	);
	return { steps, index };
}

/** The vocabulary of a steps array, built on first use and kept while the array lives. */
export function vocabularyFor(steps: StepSpec[]): Vocabulary {
	if (!Array.isArray(steps)) return buildVocabulary([]);
	let v = CACHE.get(steps);
	if (!v) {
		v = buildVocabulary(steps);
		CACHE.set(steps, v);
	}
	return v;
}
