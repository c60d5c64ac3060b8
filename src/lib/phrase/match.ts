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
/** Most said words a search reads. */
const MAX_QUERY_TOKENS = 16;
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
	/** The tokens' and pairs' numbers in the index's word list, set when the index is built. */
	ids: Int32Array;
	pairIds: Int32Array;
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
	return {
		tokens,
		pairs: pairsOf(tokens),
		set: new Set(tokens),
		hasDigits: tokens.some(isDigits),
		ids: NO_IDS,
		pairIds: NO_IDS
	};
}

const NO_IDS = new Int32Array(0);

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
	/** Each vocabulary word's number: its place in `postings`. */
	private readonly wordIds = new Map<string, number>();
	private readonly simCache = new Map<string, Similar>();
	/** Shortest name (in tokens) per step, for the estimate. */
	private readonly minLen: Int32Array;
	// scratch space for search(), reused between calls
	private acc = new Float64Array(0);
	private accTok = new Float64Array(0);
	private cur = new Float64Array(0);
	private stamp = new Int32Array(0);
	private seen = new Int32Array(0);
	private allowed = new Int8Array(0);
	/** Postings by word number. */
	private readonly postingsById: number[][] = [];
	/** Scratch for a search: each similar word's column in the tables below, else -1. */
	private column = new Int32Array(0);
	/** Per said word (row) and similar word (column): the similarity, 0 when none. */
	private simTable = new Float64Array(0);
	private pairTable = new Float64Array(0);
	private readonly qBest = new Float64Array(MAX_QUERY_TOKENS);
	private nBest = new Float64Array(0);
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
		let longest = 0;
		for (const names of this.names) {
			for (const name of names) {
				name.ids = Int32Array.from(name.tokens, (w) => this.wordId(w));
				name.pairIds = Int32Array.from(name.pairs, (w) => this.wordId(w));
				longest = Math.max(longest, name.tokens.length);
			}
		}
		this.nBest = new Float64Array(longest + 1);
		for (const [w, list] of this.postings) this.postingsById[this.wordId(w)] = list;
		this.column = new Int32Array(this.wordIds.size).fill(-1);
		for (const w of this.postings.keys()) {
			for (const key of bucketKeys(w)) {
				const list = this.buckets.get(key);
				if (list) list.push(w);
				else this.buckets.set(key, [w]);
			}
		}
	}

	private wordId(w: string): number {
		let id = this.wordIds.get(w);
		if (id === undefined) {
			id = this.wordIds.size;
			this.wordIds.set(w, id);
		}
		return id;
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
		return this.similarTo(word).map;
	}

	private similarTo(word: string): Similar {
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
		const ids = new Int32Array(found.size);
		const sims = new Float64Array(found.size);
		let k = 0;
		for (const [w, sim] of found) {
			ids[k] = this.wordIds.get(w) ?? -1;
			sims[k++] = sim;
		}
		const entry: Similar = { map: found, ids, sims };
		if (this.simCache.size >= SIM_CACHE_MAX) this.simCache.clear();
		this.simCache.set(word, entry);
		return entry;
	}

	/**
	 * Steps whose names match the said words, best first, scores 0..1. `accept` limits the
	 * steps considered (by index), e.g. to those measured in the said unit's kind.
	 */
	search(said: string[], accept?: (index: number) => boolean): ScoredStep[] {
		const qTokens = said.slice(0, MAX_QUERY_TOKENS);
		if (qTokens.length === 0) return [];
		const qPairs = pairsOf(qTokens);
		const qSims = qTokens.map((w) => this.similarTo(w));
		const pSims = qPairs.map((w) => this.similarTo(w));

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
		for (let u = 0; u < qSims.length + pSims.length; u++) {
			const weight = u < qSims.length ? 1 : 2;
			const { ids, sims } = (u < qSims.length ? qSims[u] : pSims[u - qSims.length]) as Similar;
			const stamp = ++this.stampCounter;
			for (let m = 0; m < ids.length; m++) {
				const sim = sims[m] as number;
				if (weight === 2 && sim < MIN_PAIR_SIM) continue;
				const s = sim * weight;
				const list = this.postingsById[ids[m] as number];
				if (!list) continue;
				for (let p = 0; p < list.length; p++) {
					const i = list[p] as number;
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

		// Phase 2: the full score for the best estimates. Each said word's similarities go in a
		// table with a column per similar word, so a name's words are looked up by index.
		const columns: number[] = [];
		for (const row of [...qSims, ...pSims]) {
			for (const id of row.ids) {
				if (id >= 0 && this.column[id] === -1) {
					this.column[id] = columns.length;
					columns.push(id);
				}
			}
		}
		const width = columns.length;
		if (this.simTable.length < MAX_QUERY_TOKENS * width) {
			this.simTable = new Float64Array(MAX_QUERY_TOKENS * width * 2);
			this.pairTable = new Float64Array(MAX_QUERY_TOKENS * width * 2);
		}
		layOut(this.simTable, qSims, this.column, width);
		layOut(this.pairTable, pSims, this.column, width);
		const q: Query = {
			tokens: qTokens,
			sims: this.simTable,
			pairSims: this.pairTable,
			pairCount: pSims.length,
			column: this.column,
			width,
			hasDigits: qTokens.some(isDigits),
			qBest: this.qBest,
			nBest: this.nBest
		};
		const out: ScoredStep[] = [];
		const top = Math.min(estimates.length, FULL_SCORE_LIMIT);
		for (let e = 0; e < top; e++) {
			const index = (estimates[e] as { index: number }).index;
			let best = 0;
			for (const name of this.names[index] ?? []) best = Math.max(best, scoreName(name, q));
			if (best > 0) out.push({ index, score: Math.round(best * 1000) / 1000 });
		}
		for (const id of columns) this.column[id] = -1;
		out.sort((a, b) => b.score - a.score || a.index - b.index);
		return out;
	}
}

/** The similar words of a said word, as a map and as parallel arrays of word numbers. */
interface Similar {
	map: Map<string, number>;
	ids: Int32Array;
	sims: Float64Array;
}

/** Writes each row's similarities into `table`, row by row, a column per similar word. */
function layOut(table: Float64Array, rows: Similar[], column: Int32Array, width: number): void {
	table.fill(0, 0, rows.length * width);
	for (let j = 0; j < rows.length; j++) {
		const { ids, sims } = rows[j] as Similar;
		for (let m = 0; m < ids.length; m++) {
			const id = ids[m] as number;
			if (id >= 0) table[j * width + (column[id] as number)] = sims[m] as number;
		}
	}
}

interface Query {
	tokens: string[];
	/** Row j, column c: how similar said word j is to the similar word in column c. */
	sims: Float64Array;
	/** The same for said words j and j + 1 run together. */
	pairSims: Float64Array;
	pairCount: number;
	/** Each vocabulary word's column in the tables, or -1 when no said word is like it. */
	column: Int32Array;
	width: number;
	hasDigits: boolean;
	/** Scratch: the best match of each said word, and of each name word. */
	qBest: Float64Array;
	nBest: Float64Array;
}

function scoreName(name: MatchName, q: Query): number {
	const { tokens: qTokens, sims, pairSims, column, width: V, qBest, nBest } = q;
	// a name word like no said word has column -1 and similarity 0
	const nCols = name.ids;
	const pCols = name.pairIds;
	const qLen = qTokens.length;
	const nLen = nCols.length;
	qBest.fill(0, 0, qLen);
	nBest.fill(0, 0, nLen);

	for (let j = 0; j < qLen; j++) {
		const row = j * V;
		for (let k = 0; k < nLen; k++) {
			const c = column[nCols[k] as number] as number;
			const s = c < 0 ? 0 : (sims[row + c] as number);
			if (s > (qBest[j] as number)) qBest[j] = s;
			if (s > (nBest[k] as number)) nBest[k] = s;
		}
		// a said word that matches two name words run together ("swingarm" ~ "swing arm")
		for (let k = 0; k < pCols.length; k++) {
			const c = column[pCols[k] as number] as number;
			if (c < 0) continue;
			const s = sims[row + c] as number;
			if (s < MIN_PAIR_SIM) continue;
			if (s > (qBest[j] as number)) qBest[j] = s;
			if (s > (nBest[k] as number)) nBest[k] = s;
			if (s > (nBest[k + 1] as number)) nBest[k + 1] = s;
		}
	}
	// two said words run together that match one name word ("swing arm" ~ "swingarm")
	for (let j = 0; j < q.pairCount; j++) {
		const row = j * V;
		for (let k = 0; k < nLen; k++) {
			const c = column[nCols[k] as number] as number;
			if (c < 0) continue;
			const s = pairSims[row + c] as number;
			if (s < MIN_PAIR_SIM) continue;
			if (s > (qBest[j] as number)) qBest[j] = s;
			if (s > (qBest[j + 1] as number)) qBest[j + 1] = s;
			if (s > (nBest[k] as number)) nBest[k] = s;
		}
	}

	let qSum = 0;
	for (let j = 0; j < qLen; j++) qSum += qBest[j] as number;
	let nSum = 0;
	for (let k = 0; k < nLen; k++) nSum += nBest[k] as number;
	const precision = qSum / qLen;
	const recall = nSum / Math.max(1, nLen);
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
