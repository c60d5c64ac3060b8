import Fuse from 'fuse.js';
import { findNumbers } from './numbers';
import { normalizeText, stem, tokenize } from './text';

/**
 * Step matching. Fuse.js finds, for each word said, the similar words in the vocabulary (the
 * words of every step label and alias, plus each adjacent pair run together so "swingarm"
 * meets "swing arm"); a step then scores by how much of what was said it explains and how much
 * of its name was said. Word order does not matter, misspellings are tolerated, filler words
 * are ignored, and a word that contradicts the name (front against rear, cylinder 1 against
 * cylinder 2) counts against it. The index is built once per vocabulary.
 */

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

/** Mutually exclusive qualifiers: saying one and reading the other is a contradiction. */
const OPPOSITES: Record<string, string[]> = {
	front: ['rear', 'back'],
	rear: ['front'],
	back: ['front'],
	left: ['right', 'rh'],
	right: ['left', 'lh'],
	lh: ['rh', 'right'],
	rh: ['lh', 'left'],
	upper: ['lower'],
	lower: ['upper'],
	top: ['bottom'],
	bottom: ['top'],
	inner: ['outer'],
	outer: ['inner'],
	intake: ['exhaust'],
	inlet: ['exhaust'],
	exhaust: ['intake', 'inlet'],
	min: ['max'],
	max: ['min'],
	primary: ['secondary'],
	secondary: ['primary']
};

const MIN_WORD_SIM = 0.7;
/** Words run together must match nearly whole: "fork" is a prefix of "forkoil", not a match. */
const MIN_PAIR_SIM = 0.85;
const FUSE_LIMIT = 40;
const SIM_CACHE_MAX = 4000;
/** Steps whose estimate is below this are not scored (the match threshold is 0.55). */
const MIN_ESTIMATE = 0.4;
/** How many of the best estimates get the full score. */
const FULL_SCORE_LIMIT = 64;

export interface MatchName {
	tokens: string[];
	/** Adjacent token pairs run together: ['swingarm', 'armpivot']. */
	pairs: string[];
	set: Set<string>;
	hasDigits: boolean;
}

export interface ScoredStep {
	index: number;
	score: number;
}

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

function nameOf(text: string): MatchName {
	// a name made only of filler words ("Check", "Set") keeps them
	let tokens = matchTokens(text);
	if (tokens.length === 0) {
		tokens = tokenize(normalizeText(String(text ?? '')))
			.filter((t) => /[\p{L}\p{N}]/u.test(t))
			.map(stem);
	}
	return { tokens, pairs: pairsOf(tokens), set: new Set(tokens), hasDigits: tokens.some(isDigits) };
}

function pairsOf(tokens: string[]): string[] {
	const pairs: string[] = [];
	for (let i = 0; i + 1 < tokens.length; i++) pairs.push((tokens[i] ?? '') + (tokens[i + 1] ?? ''));
	return pairs;
}

function bucketKeys(w: string): string[] {
	return w.length >= 2 ? ['1' + w[0], '2' + w[1]] : [];
}

const isDigits = (w: string) => /^-?[\d.]+$/.test(w);

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

export class StepIndex {
	readonly names: MatchName[][];
	/** Vocabulary words by first letter and by second letter; one Fuse index each, built lazily.
	 * A word said with either of its first two letters right finds its match, and each search
	 * runs over a small share of the vocabulary. */
	private readonly buckets = new Map<string, string[]>();
	private readonly fuses = new Map<string, Fuse<string>>();
	private readonly postings = new Map<string, number[]>();
	private readonly simCache = new Map<string, Map<string, number>>();
	/** Shortest name (in tokens) per step, for the estimate. */
	private readonly minLen: Int32Array;
	// scratch space for search(), reused between calls
	private acc = new Float64Array(0);
	private accTok = new Float64Array(0);
	private cur = new Float64Array(0);
	private stamp = new Int32Array(0);
	private seen = new Int32Array(0);
	private allowed = new Int8Array(0);
	private epoch = 0;
	private stampCounter = 0;

	constructor(labels: { label: string; aliases: string[] }[]) {
		this.names = labels.map(({ label, aliases }) =>
			[label, ...aliases].map(nameOf).filter((n) => n.tokens.length > 0)
		);
		this.minLen = Int32Array.from(this.names, (names) =>
			Math.max(1, Math.min(...names.map((n) => n.tokens.length), 64))
		);
		this.names.forEach((names, index) => {
			for (const name of names) {
				for (const w of [...name.tokens, ...name.pairs]) {
					const list = this.postings.get(w);
					if (!list) this.postings.set(w, [index]);
					else if (list[list.length - 1] !== index) list.push(index);
				}
			}
		});
		for (const w of this.postings.keys()) {
			for (const key of bucketKeys(w)) {
				const list = this.buckets.get(key);
				if (list) list.push(w);
				else this.buckets.set(key, [w]);
			}
		}
	}

	private fuseFor(key: string): Fuse<string> | null {
		let f = this.fuses.get(key);
		if (f) return f;
		const words = this.buckets.get(key);
		if (!words) return null;
		f = new Fuse(words, {
			includeScore: true,
			threshold: 0.4,
			ignoreLocation: true,
			minMatchCharLength: 2,
			shouldSort: true
		});
		this.fuses.set(key, f);
		return f;
	}

	get size(): number {
		return this.names.length;
	}

	/** Vocabulary words similar to `word`, with their similarity. */
	similar(word: string): Map<string, number> {
		const cached = this.simCache.get(word);
		if (cached) return cached;
		const found = new Map<string, number>();
		if (this.postings.has(word)) found.set(word, 1);
		if (!isDigits(word) && word.length >= 3) {
			for (const key of bucketKeys(word)) {
				for (const r of this.fuseFor(key)?.search(word, { limit: FUSE_LIMIT }) ?? []) {
					if (found.has(r.item)) continue;
					const sim = wordSimilarity(word, r.item);
					if (sim > 0) found.set(r.item, sim);
				}
			}
		}
		if (this.simCache.size >= SIM_CACHE_MAX) this.simCache.clear();
		this.simCache.set(word, found);
		return found;
	}

	/**
	 * Steps whose names match the said words, best first, scores 0..1. `accept` limits the
	 * steps considered (by index), e.g. to those measured in the said unit's kind.
	 */
	search(said: string[], accept?: (index: number) => boolean): ScoredStep[] {
		const qTokens = said.slice(0, 16);
		if (qTokens.length === 0) return [];
		const qPairs = pairsOf(qTokens);
		const qSims = qTokens.map((w) => this.similar(w));
		const pSims = qPairs.map((w) => this.similar(w));
		const q: Query = {
			tokens: qTokens,
			sims: qSims,
			pairSims: pSims,
			hasDigits: qTokens.some(isDigits)
		};

		// Phase 1: a cheap estimate from the postings of every similar word, so that only the
		// most promising steps get the full score (a 5,000-step vocabulary shares many words).
		const n = this.names.length;
		if (this.acc.length !== n) {
			this.acc = new Float64Array(n);
			this.accTok = new Float64Array(n);
			this.cur = new Float64Array(n);
			this.stamp = new Int32Array(n);
			this.seen = new Int32Array(n);
			this.allowed = new Int8Array(n);
		}
		if (this.stampCounter > 1e9) {
			this.stamp.fill(0);
			this.seen.fill(0);
			this.stampCounter = 0;
			this.epoch = 0;
		}
		const epoch = ++this.epoch;
		const touched: number[] = [];
		const units = [...qSims.map((m) => [m, 1] as const), ...pSims.map((m) => [m, 2] as const)];
		for (const [sims, weight] of units) {
			const stamp = ++this.stampCounter;
			for (const [w, sim] of sims) {
				if (weight === 2 && sim < MIN_PAIR_SIM) continue;
				const s = sim * weight;
				for (const i of this.postings.get(w) ?? []) {
					if (this.seen[i] !== epoch) {
						this.seen[i] = epoch;
						this.acc[i] = 0;
						this.accTok[i] = 0;
						this.allowed[i] = accept ? (accept(i) ? 1 : 2) : 1;
						if (this.allowed[i] === 1) touched.push(i);
					}
					if (this.allowed[i] !== 1) continue;
					let delta = 0;
					if (this.stamp[i] !== stamp) {
						this.stamp[i] = stamp;
						this.cur[i] = s;
						delta = s;
					} else if (s > (this.cur[i] ?? 0)) {
						delta = s - (this.cur[i] ?? 0);
						this.cur[i] = s;
					}
					this.acc[i] = (this.acc[i] ?? 0) + delta;
					if (weight === 1) this.accTok[i] = (this.accTok[i] ?? 0) + delta;
				}
			}
		}
		const qLen = qTokens.length;
		const estimates: { index: number; est: number; len: number }[] = [];
		for (const i of touched) {
			const len = this.minLen[i] ?? 1;
			const est =
				0.55 * Math.min(1, (this.accTok[i] ?? 0) / qLen) +
				0.45 * Math.min(1, (this.acc[i] ?? 0) / len);
			if (est >= MIN_ESTIMATE) estimates.push({ index: i, est, len });
		}
		// equal estimates: shorter names first, as they will score higher on recall
		estimates.sort((x, y) => y.est - x.est || x.len - y.len || x.index - y.index);

		// Phase 2: the full score for the best estimates.
		const out: ScoredStep[] = [];
		for (const { index } of estimates.slice(0, FULL_SCORE_LIMIT)) {
			let best = 0;
			for (const name of this.names[index] ?? []) best = Math.max(best, scoreName(name, q));
			if (best > 0) out.push({ index, score: Math.round(best * 1000) / 1000 });
		}
		out.sort((a, b) => b.score - a.score || a.index - b.index);
		return out;
	}
}

interface Query {
	tokens: string[];
	sims: Map<string, number>[];
	pairSims: Map<string, number>[];
	hasDigits: boolean;
}

function scoreName(name: MatchName, q: Query): number {
	const { tokens: qTokens, sims: qSims, pairSims: pSims } = q;
	const nT = name.tokens;
	const qBest = new Array<number>(qTokens.length).fill(0);
	const nBest = new Array<number>(nT.length).fill(0);

	for (let j = 0; j < qTokens.length; j++) {
		const sims = qSims[j];
		if (!sims) continue;
		for (let k = 0; k < nT.length; k++) {
			const s = sims.get(nT[k] ?? '') ?? 0;
			if (s > (qBest[j] ?? 0)) qBest[j] = s;
			if (s > (nBest[k] ?? 0)) nBest[k] = s;
		}
		// a said word that matches two name words run together ("swingarm" ~ "swing arm")
		for (let k = 0; k < name.pairs.length; k++) {
			const s = sims.get(name.pairs[k] ?? '') ?? 0;
			if (s < MIN_PAIR_SIM) continue;
			if (s > (qBest[j] ?? 0)) qBest[j] = s;
			if (s > (nBest[k] ?? 0)) nBest[k] = s;
			if (s > (nBest[k + 1] ?? 0)) nBest[k + 1] = s;
		}
	}
	// two said words run together that match one name word ("swing arm" ~ "swingarm")
	for (let j = 0; j < pSims.length; j++) {
		const sims = pSims[j];
		if (!sims) continue;
		for (let k = 0; k < nT.length; k++) {
			const s = sims.get(nT[k] ?? '') ?? 0;
			if (s < MIN_PAIR_SIM) continue;
			if (s > (qBest[j] ?? 0)) qBest[j] = s;
			if (s > (qBest[j + 1] ?? 0)) qBest[j + 1] = s;
			if (s > (nBest[k] ?? 0)) nBest[k] = s;
		}
	}

	const precision = qBest.reduce((a, b) => a + b, 0) / qTokens.length;
	const recall = nBest.reduce((a, b) => a + b, 0) / Math.max(1, nT.length);
	if (precision === 0) return 0;
	let score = 0.55 * precision + 0.45 * recall;

	// contradictions: "rear" said, "front" in the name; "cylinder 2" said, "cylinder 1" named
	const nameSet = name.set;
	for (const t of qTokens) {
		if (nameSet.has(t)) continue;
		const opp = OPPOSITES[t];
		if (opp && opp.some((o) => nameSet.has(o))) score *= 0.4;
	}
	if (q.hasDigits && name.hasDigits && !qTokens.some((d) => isDigits(d) && nameSet.has(d))) {
		score *= 0.4;
	}
	return Math.min(1, score);
}
