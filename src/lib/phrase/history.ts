// "history rear axle": a step's past readings on this vehicle, asked from the call bar. Like
// "spec …" it logs nothing. Pure and synchronous, as the rest of the phrase engine.

// Longest first, so "show the history of" wins over "history".
const PREFIXES = [
	'show me the history of',
	'show me the history for',
	'show the history of',
	'show the history for',
	'what was it last time for',
	'last time for',
	'show history of',
	'show history for',
	'show history',
	'past readings for',
	'past readings of',
	'past readings',
	'past values for',
	'past values of',
	'past values',
	'last values for',
	'last values of',
	'last values',
	'history of',
	'history for',
	'history'
].map((p) => p.split(' '));

const SUFFIXES = [['history'], ['last', 'time'], ['past', 'readings'], ['past', 'values']];

/**
 * The step words of a history question ("history rear axle", "rear axle history", "past
 * readings for the chain slack"): the tokens between the question's words, possibly none; null
 * when the tokens are not a history question.
 */
export function historyWords(tokens: readonly string[]): string[] | null {
	for (const p of PREFIXES) {
		if (p.length <= tokens.length && p.every((w, i) => tokens[i] === w)) {
			return tokens.slice(p.length);
		}
	}
	for (const s of SUFFIXES) {
		const off = tokens.length - s.length;
		if (off >= 1 && s.every((w, i) => tokens[off + i] === w)) return tokens.slice(0, off);
	}
	return null;
}
