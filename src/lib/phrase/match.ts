/**
 * Step matching. Fuse.js finds, for each word said, the similar words in the vocabulary (the
 * words of every step label and alias, plus each adjacent pair run together so "swingarm"
 * meets "swing arm"); a step then scores by how much of what was said it explains and how much
 * of its name was said. Word order does not matter, misspellings are tolerated, filler words
 * are ignored, and a word that contradicts the name (front against rear, cylinder 1 against
 * cylinder 2) counts against it. The index is built once per vocabulary.
 */
import Fuse from 'fuse.js';
import { layOut, nameOf, scoreName, type MatchName, type Query, type Similar } from './score';
import { isDigits, MIN_PAIR_SIM, pairsOf, wordSimilarity } from './similarity';

const FUSE_LIMIT = 40;
const SIM_CACHE_MAX = 4000;
/** Most said words a search reads. */
const MAX_QUERY_TOKENS = 16;
/** Steps whose estimate is below this are not scored (the match threshold is 0.55). */
const MIN_ESTIMATE = 0.4;
/** How many of the best estimates get the full score. */
const FULL_SCORE_LIMIT = 64;

export interface ScoredStep {
	index: number;
	score: number;
}

function bucketKeys(w: string): string[] {
	return w.length >= 2 ? ['1' + w[0], '2' + w[1]] : [];
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
