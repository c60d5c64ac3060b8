/**
 * Words for matching: what is said and what a step is named, both turned into match tokens
 * (numbers as digits, filler words out, plurals folded), and how alike two words are.
 */
import { findNumbers } from './numbers';
import { normalizeText, stem, tokenize } from './text';

/** Words ignored on both sides, so "torqued to", "fill", "check the" never decide a match. */
export const FILLER_WORDS: ReadonlySet<string> = new Set([
	'torque',
	'torqued',
	'tightened',
	'tighten',
	'to',
	'set',
	'at',
	'the',
	'filled',
	'fill',
	'check',
	'checked',
	'a',
	'an',
	'of',
	'for',
	'on',
	'is',
	'was',
	'and',
	'with',
	'it',
	'its',
	'i',
	'my',
	'um',
	'uh',
	'er',
	'erm',
	'please',
	'measured',
	'reading',
	'reads',
	'read',
	'value',
	'adjusted',
	'adjust',
	'added',
	'topped',
	'up',
	'now',
	'just',
	'gave',
	'got',
	'came',
	'out',
	'in',
	'spec',
	'specification'
]);

const MIN_WORD_SIM = 0.7;
/** Words run together must match nearly whole: "fork" is a prefix of "forkoil", not a match. */
export const MIN_PAIR_SIM = 0.85;

/** Turns a label, alias or the said words into match tokens. */
export function matchTokens(text: string): string[] {
	return toMatchTokens(tokenize(normalizeText(String(text ?? ''))));
}

/** Match tokens from already tokenised words: numbers as digits, fillers out, plurals folded. */
export function toMatchTokens(tokens: string[]): string[] {
	const spans = findNumbers(tokens);
	const out: string[] = [];
	let i = 0;
	let s = 0;
	while (i < tokens.length) {
		const span = spans[s];
		if (span && span.start === i) {
			out.push(span.decimal);
			i = span.end;
			s++;
			continue;
		}
		const t = tokens[i] ?? '';
		i++;
		if (!/[\p{L}\p{N}]/u.test(t)) continue;
		if (FILLER_WORDS.has(t)) continue;
		out.push(stem(t).slice(0, 32));
	}
	return out;
}

/** Adjacent tokens run together: swing arm pivot → swingarm, armpivot. */
export function pairsOf(tokens: string[]): string[] {
	const pairs: string[] = [];
	for (let i = 0; i + 1 < tokens.length; i++) pairs.push((tokens[i] ?? '') + (tokens[i + 1] ?? ''));
	return pairs;
}

export const isDigits = (w: string) => /^-?[\d.]+$/.test(w);

/** Damerau–Levenshtein (optimal string alignment) distance, for short words. */
function editDistance(a: string, b: string): number {
	const m = a.length;
	const n = b.length;
	if (m === 0) return n;
	if (n === 0) return m;
	let prev2: number[] = new Array<number>(n + 1).fill(0);
	let prev: number[] = Array.from({ length: n + 1 }, (_, j) => j);
	let cur: number[] = new Array<number>(n + 1).fill(0);
	for (let i = 1; i <= m; i++) {
		cur[0] = i;
		for (let j = 1; j <= n; j++) {
			const cost = a[i - 1] === b[j - 1] ? 0 : 1;
			let v = Math.min((prev[j] ?? 0) + 1, (cur[j - 1] ?? 0) + 1, (prev[j - 1] ?? 0) + cost);
			if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) {
				v = Math.min(v, (prev2[j - 2] ?? 0) + 1);
			}
			cur[j] = v;
		}
		[prev2, prev, cur] = [prev, cur, prev2];
	}
	return prev[n] ?? Math.max(m, n);
}

/** Similarity of two words, 0..1: 1 identical, ~0.8 one typo, prefixes ("temp") count. */
export function wordSimilarity(a: string, b: string): number {
	if (a === b) return 1;
	if (isDigits(a) || isDigits(b)) return 0;
	const short = Math.min(a.length, b.length);
	const long = Math.max(a.length, b.length);
	if (short <= 2) return 0;
	let sim = 1 - editDistance(a, b) / long;
	if (short >= 3 && (a.startsWith(b) || b.startsWith(a))) {
		sim = Math.max(sim, 0.72 + 0.2 * (short / long));
	}
	return sim >= MIN_WORD_SIM ? sim : 0;
}
