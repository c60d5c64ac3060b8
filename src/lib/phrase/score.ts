/**
 * The full score of a step's name against the said words: how much of what was said it
 * explains (precision) and how much of the name was said (recall), with a penalty for a word
 * that contradicts the name (front against rear, cylinder 1 against cylinder 2).
 */
import { isDigits, matchTokens, MIN_PAIR_SIM, pairsOf } from './similarity';
import { normalizeText, stem, tokenize } from './text';

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

/** A label or alias as the index keeps it. */
export function nameOf(text: string): MatchName {
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

/** The similar words of a said word, as a map and as parallel arrays of word numbers. */
export interface Similar {
	map: Map<string, number>;
	ids: Int32Array;
	sims: Float64Array;
}

/** Writes each row's similarities into `table`, row by row, a column per similar word. */
export function layOut(
	table: Float64Array,
	rows: Similar[],
	column: Int32Array,
	width: number
): void {
	table.fill(0, 0, rows.length * width);
	for (let j = 0; j < rows.length; j++) {
		const { ids, sims } = rows[j] as Similar;
		for (let m = 0; m < ids.length; m++) {
			const id = ids[m] as number;
			if (id >= 0) table[j * width + (column[id] as number)] = sims[m] as number;
		}
	}
}

export interface Query {
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

export function scoreName(name: MatchName, q: Query): number {
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
