/** Normalising and splitting a called-out phrase into tokens. */

/** Longest input read; the rest is ignored (and said so), which keeps parse time bounded. */
export const MAX_PHRASE_CHARS = 400;
/** Most tokens read from a phrase. */
export const MAX_TOKENS = 48;

const PRINTABLE_ASCII_RE = /^[\x20-\x7e]*$/;

/**
 * Lower case, compatibility forms folded (full-width digits, ℃, ², ³), accents dropped,
 * dashes, quotes and unit separators unified.
 */
export function normalizeText(text: string): string {
	// printable ASCII needs none of the Unicode folding: only case, backquotes and '*'
	if (PRINTABLE_ASCII_RE.test(text)) {
		return text.toLowerCase().replace(/`/g, "'").replace(/\*/g, ' ');
	}
	return foldText(text);
}

/** normalizeText's full path, for any text (exported for its test). */
export function foldText(text: string): string {
	return text
		.replace(/º/g, '°')
		.normalize('NFKC')
		.normalize('NFD')
		.replace(/[\u0300-\u036f]/g, '')
		.normalize('NFC')
		.toLowerCase()
		.replace(/[\u2018\u2019\u02bc\u0060\u00b4]/g, "'")
		.replace(/[\u201c\u201d\u2033]/g, '"')
		.replace(/[\u2010-\u2015\u2212]/g, '-')
		.replace(/[\u00b7\u22c5\u2022\u2219\u00d7*]/g, ' ')
		.replace(/[\p{Cc}\p{Cf}\p{Zl}\p{Zp}\p{Zs}]/gu, ' ');
}

const OIL_GRADE_RE = /^\d{1,2}w-?\d{1,2}$/;
const ORDINAL_RE = /^\d+(?:st|nd|rd|th)$/;
const NUMBER_THEN_LETTERS_RE = /^(-?(?:\d+(?:[.,]\d+)?|[.,]\d+))([a-z°"µμωℓ/][^\s]*)$/;

/** Splits normalised text into tokens: words, numbers, unit pieces. */
export function tokenize(normalized: string): string[] {
	const s = normalized
		// oil grades stay whole: "10w-30", "10w/30", "10 w 30" → "10w-30"
		.replace(/\b(\d{1,2})\s?w\s?[-/]?\s?(\d{1,2})\b/g, '$1w-$2')
		.replace(/(?<=[a-z])'(?=[a-z])/g, '')
		.replace(/(?<=\d)"/g, ' " ')
		.replace(/"(?=\S)|(?<=\S)"/g, ' ')
		.replace(/(?<=[a-z°µμω])[.](?=[a-z])/g, ' ')
		.replace(/(?<![\d])[.,](?!\d)|(?<=\d)[.,](?!\d)/g, ' ')
		.replace(
			/(?<=[a-z])(?<!\dw)-(?=[a-z\d])|(?<=\d)-(?=[a-z])|(?<=\s|^)-(?=\s|$)|(?<=[a-z\d])-(?=\s|$)/g,
			' '
		)
		.replace(/[!?;:()[\]{}<>'`#~@&=+|\\^$%]/g, ' ');
	const tokens: string[] = [];
	for (const raw of s.split(/\s+/)) {
		if (raw === '') continue;
		if (tokens.length >= MAX_TOKENS) break;
		if (OIL_GRADE_RE.test(raw) || ORDINAL_RE.test(raw)) {
			tokens.push(raw);
			continue;
		}
		const m = NUMBER_THEN_LETTERS_RE.exec(raw);
		if (m && m[1] !== undefined && m[2] !== undefined) tokens.push(m[1], m[2]);
		else tokens.push(raw);
	}
	return tokens.slice(0, MAX_TOKENS);
}

/** Plural and possessive forms folded for matching: nuts → nut, bolts → bolt. */
export function stem(word: string): string {
	if (word.length > 3 && word.endsWith('s') && !/(?:ss|us|is|psi)$/.test(word)) {
		return word.slice(0, -1);
	}
	return word;
}
