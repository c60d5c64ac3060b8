/**
 * Numbers as people type or say them: digits ("24.5", "0,85", "1,500"), words ("twenty four
 * point five", "a hundred and ten", "zero point one", "one and a half") and mixtures ("24 point
 * 5"). The value is assembled as a decimal string and read once, so "two point three five" is
 * 2.35, not 2.3499999999999996.
 */

const DIGIT_WORDS: Record<string, number> = {
	zero: 0,
	nought: 0,
	naught: 0,
	one: 1,
	two: 2,
	three: 3,
	four: 4,
	five: 5,
	six: 6,
	seven: 7,
	eight: 8,
	nine: 9
};
// Only after "point": "point oh five".
const FRACTION_ZERO = new Set(['oh', 'o']);
const TEENS: Record<string, number> = {
	ten: 10,
	eleven: 11,
	twelve: 12,
	thirteen: 13,
	fourteen: 14,
	fifteen: 15,
	sixteen: 16,
	seventeen: 17,
	eighteen: 18,
	nineteen: 19
};
const TENS: Record<string, number> = {
	twenty: 20,
	thirty: 30,
	forty: 40,
	fourty: 40,
	fifty: 50,
	sixty: 60,
	seventy: 70,
	eighty: 80,
	ninety: 90
};
const POINT = new Set(['point', 'dot', 'decimal']);
const NEGATIVE = new Set(['minus', 'negative']);

const DIGITS_RE = /^-?(?:\d+(?:[.,]\d+)?|[.,]\d+)$/;
const THOUSANDS_RE = /^-?[1-9]\d{0,2}(?:,\d{3})+$/;

export interface NumberSpan {
	value: number;
	/** The number as a plain decimal string, e.g. '24.5', '-3', '110'. */
	decimal: string;
	/** Index of the first token and one past the last token of the span. */
	start: number;
	end: number;
}

export function isNumberWord(token: string): boolean {
	return (
		token in DIGIT_WORDS ||
		token in TEENS ||
		token in TENS ||
		token === 'hundred' ||
		token === 'thousand'
	);
}

function has(map: Record<string, number>, key: string | undefined): key is string {
	return key !== undefined && Object.prototype.hasOwnProperty.call(map, key);
}

/** A digit token as a decimal string: '0,85' → '0.85', '1,500' → '1500' (thousands). */
export function digitsToDecimal(token: string): string | null {
	if (THOUSANDS_RE.test(token)) return token.replace(/,/g, '');
	if (!DIGITS_RE.test(token)) return null;
	let s = token.replace(',', '.');
	if (s.startsWith('.')) s = '0' + s;
	if (s.startsWith('-.')) s = '-0' + s.slice(1);
	return s;
}

type Kind = 'none' | 'digit' | 'teen' | 'tens' | 'hundred' | 'thousand';

/** Reads a whole number in words starting at i; returns its value and end, or null. */
function readWordInteger(tokens: string[], i: number): { value: number; end: number } | null {
	let total = 0;
	let current = 0;
	let last: Kind = 'none';
	let j = i;
	let end = i;
	while (j < tokens.length) {
		const t = tokens[j];
		if (t === undefined) break;
		if ((t === 'a' || t === 'an') && last === 'none') {
			const next = tokens[j + 1];
			if (next === 'hundred' || next === 'thousand') {
				current = 1;
				last = 'digit';
				j++;
				continue;
			}
			break;
		}
		if (t === 'and' && (last === 'hundred' || last === 'thousand')) {
			const next = tokens[j + 1];
			if (has(DIGIT_WORDS, next) || has(TEENS, next) || has(TENS, next)) {
				j++;
				continue;
			}
			break;
		}
		if (has(DIGIT_WORDS, t)) {
			if (last === 'digit' || last === 'teen') break;
			// "twenty zero" is not a number; "hundred and zero" neither
			if (DIGIT_WORDS[t] === 0 && last !== 'none') break;
			current += DIGIT_WORDS[t] ?? 0;
			last = 'digit';
		} else if (has(TEENS, t)) {
			if (last === 'digit' || last === 'teen' || last === 'tens') break;
			current += TEENS[t] ?? 0;
			last = 'teen';
		} else if (has(TENS, t)) {
			if (last === 'digit' || last === 'teen' || last === 'tens') break;
			current += TENS[t] ?? 0;
			last = 'tens';
		} else if (t === 'hundred') {
			if (last !== 'digit' && last !== 'teen') break;
			if (current % 100 === 0 || current >= 100) break;
			current *= 100;
			last = 'hundred';
		} else if (t === 'thousand') {
			if (last === 'none' || last === 'thousand' || total > 0) break;
			total += current * 1000;
			current = 0;
			last = 'thousand';
		} else {
			break;
		}
		j++;
		end = j;
	}
	if (end === i) return null;
	return { value: total + current, end };
}

/** Reads the digits after "point": "two five", "twenty five", "oh five", "25". */
function readFraction(tokens: string[], i: number): { digits: string; end: number } {
	let digits = '';
	let j = i;
	while (j < tokens.length && digits.length < 12) {
		const t = tokens[j];
		if (t === undefined) break;
		if (has(DIGIT_WORDS, t)) digits += String(DIGIT_WORDS[t]);
		else if (FRACTION_ZERO.has(t)) digits += '0';
		else if (/^\d+$/.test(t)) digits += t;
		else if (has(TEENS, t)) digits += String(TEENS[t]);
		else if (has(TENS, t)) {
			const next = tokens[j + 1];
			const tens = String((TENS[t] ?? 0) / 10);
			if (has(DIGIT_WORDS, next) && DIGIT_WORDS[next] !== 0) {
				digits += tens + String(DIGIT_WORDS[next]);
				j++;
			} else digits += tens + '0';
		} else break;
		j++;
	}
	return { digits, end: j };
}

/** Reads one number starting exactly at token i, or returns null. */
export function readNumberAt(tokens: string[], i: number): NumberSpan | null {
	let j = i;
	let negative = false;
	if (NEGATIVE.has(tokens[j] ?? '')) {
		negative = true;
		j++;
	}
	const first = tokens[j];
	if (first === undefined) return null;

	let intPart: string | null = null;
	let fraction = '';
	const digits = digitsToDecimal(first);
	if (digits !== null) {
		if (digits.startsWith('-')) {
			if (negative) return null;
			negative = true;
		}
		const unsigned = digits.replace(/^-/, '');
		const [ip, fp] = unsigned.split('.');
		intPart = ip ?? '0';
		fraction = fp ?? '';
		j++;
	} else if (!POINT.has(first)) {
		const w = readWordInteger(tokens, j);
		if (!w) return null;
		intPart = String(w.value);
		j = w.end;
	}

	// "… point five", also "point five" alone and "24 point 5"
	if (fraction === '' && POINT.has(tokens[j] ?? '')) {
		const f = readFraction(tokens, j + 1);
		if (f.digits !== '') {
			fraction = f.digits;
			j = f.end;
		}
	}
	if (intPart === null && fraction === '') return null;
	if (intPart === null) intPart = '0';

	// "one and a half"
	if (fraction === '' && tokens[j] === 'and') {
		if (tokens[j + 1] === 'a' && tokens[j + 2] === 'half') {
			fraction = '5';
			j += 3;
		} else if (tokens[j + 1] === 'half') {
			fraction = '5';
			j += 2;
		}
	}

	const decimal = (negative ? '-' : '') + intPart + (fraction ? '.' + fraction : '');
	const value = Number(decimal);
	if (!Number.isFinite(value)) return null;
	return { value: Object.is(value, -0) ? 0 : value, decimal, start: i, end: j };
}

/** All numbers in a token list, left to right, none overlapping. */
export function findNumbers(tokens: string[]): NumberSpan[] {
	const spans: NumberSpan[] = [];
	let i = 0;
	while (i < tokens.length) {
		const span = readNumberAt(tokens, i);
		if (span && span.end > i) {
			spans.push(span);
			i = span.end;
		} else i++;
	}
	return spans;
}

/** Reads a whole phrase as one number ("twenty four point five" → 24.5), or null. */
export function wordsToNumber(text: string): number | null {
	const tokens = String(text)
		.toLowerCase()
		.replace(/-(?=[a-z])/g, ' ')
		.split(/\s+/)
		.filter(Boolean);
	const span = readNumberAt(tokens, 0);
	return span && span.end === tokens.length ? span.value : null;
}
