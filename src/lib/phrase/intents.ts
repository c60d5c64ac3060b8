/**
 * The words that say what a phrase is for: undo, next, cancel, spec, a part fitted, a step
 * done, a note. Matched on whole tokens at the start or the end of the phrase.
 */
import { normalizeText, tokenize } from './text';

export const UNDO_PHRASES = new Set([
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
export const NEXT_PHRASES = new Set([
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
export const CANCEL_PHRASES = new Set([
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
export const SPEC_PREFIXES = [
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
export const SPEC_SUFFIXES = [['spec'], ['specs'], ['spec', 'please']];
export const PART_PREFIXES = [
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
export const PART_SUFFIXES = [['replaced'], ['renewed'], ['changed'], ['fitted'], ['installed']];
export const DONE_PREFIXES = [
	'mark done',
	'done with',
	'done',
	'finished',
	'completed',
	'complete'
].map((p) => p.split(' '));
export const DONE_SUFFIXES = [
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
export const NOTE_RE = /^\s*(?:add\s+(?:a\s+)?)?notes?\b[\s:,.;-]*([\s\S]*)$/i;

/** How many tokens a prefix in `prefixes` covers at the start, or 0. */
export function startsWith(tokens: string[], prefixes: string[][]): number {
	for (const p of prefixes) {
		if (p.length <= tokens.length && p.every((w, i) => tokens[i] === w)) return p.length;
	}
	return 0;
}

/** How many tokens a suffix covers at the end (never the whole phrase), or 0. */
export function endsWith(tokens: string[], suffixes: string[][]): number {
	let best = 0;
	for (const s of suffixes) {
		const off = tokens.length - s.length;
		if (off >= 1 && s.every((w, i) => tokens[off + i] === w)) best = Math.max(best, s.length);
	}
	return best;
}

/** True when the phrase cancels a pending voice entry ("cancel", "cancel that", "never mind"). */
export function isCancel(text: string): boolean {
	if (typeof text !== 'string' || text.length > 60) return false;
	return CANCEL_PHRASES.has(tokenize(normalizeText(text)).join(' '));
}
