/**
 * Engine speeds said in pairs: "thirteen fifty" or "13 50" for 1350 rpm, common practice in
 * workshops (as "eleven hundred" is 1100). Two numbers side by side before a unit are read as
 * one pair only for a speed (rpm, or no unit said); otherwise they are asked about, never
 * reduced to the last one silently.
 */
import type { NumberSpan } from './numbers';

/**
 * The numbers that are part of some step's name ("upper caliper screw 1234", "pad #2"): each
 * word of a label or alias, and its tail after a '#' or '-'. Built once per vocabulary, so a
 * phrase asks a set rather than testing every name.
 */
export function numbersInNames(steps: { label: string; aliases?: string[] }[]): Set<string> {
	const out = new Set<string>();
	for (const st of steps) {
		const names = [st.label, ...(Array.isArray(st.aliases) ? st.aliases : [])];
		for (const name of names) {
			for (const word of String(name).split(/\s/)) {
				out.add(word);
				for (let k = 0; k < word.length; k++) {
					if (word[k] === '#' || word[k] === '-') out.add(word.slice(k + 1));
				}
			}
		}
	}
	return out;
}

export type PairReading =
	{ kind: 'single' } | { kind: 'pair'; span: NumberSpan } | { kind: 'ask'; problem: string };

const isWord = (t: string) => /^[a-z]+$/.test(t);

/** The part of a pair said first: 1–99, as one or two digits or as words. */
function leading(tokens: string[], s: NumberSpan): boolean {
	const text = tokens.slice(s.start, s.end);
	if (!Number.isInteger(s.value) || s.value < 1 || s.value > 99) return false;
	return text.length === 1 ? /^\d{1,2}$/.test(text[0]) || isWord(text[0]) : text.every(isWord);
}

/** The part said second: two digits ("50", "05") or words for 10–99 ("fifty", "fifty five"). */
function trailing(tokens: string[], s: NumberSpan): boolean {
	const text = tokens.slice(s.start, s.end);
	if (text.length === 1 && /^\d{2}$/.test(text[0])) return true;
	return Number.isInteger(s.value) && s.value >= 10 && s.value <= 99 && text.every(isWord);
}

/**
 * Looks at the number just before the chosen value. `unit` is the UCUM code said after the
 * value, or null when none was said.
 */
export function readPair(
	tokens: string[],
	spans: NumberSpan[],
	value: NumberSpan,
	unit: string | null,
	inName: (decimal: string) => boolean
): PairReading {
	const k = spans.indexOf(value);
	const before = k > 0 ? spans[k - 1] : undefined;
	if (!before || before.end !== value.start || inName(before.decimal)) return { kind: 'single' };
	const speed = unit === null || unit === '/min';
	if (speed && leading(tokens, before) && trailing(tokens, value)) {
		const combined = before.value * 100 + value.value;
		return {
			kind: 'pair',
			span: { value: combined, decimal: String(combined), start: before.start, end: value.end }
		};
	}
	return {
		kind: 'ask',
		problem: `Two numbers heard side by side (${before.decimal} and ${value.decimal}): say the value once, e.g. "${value.decimal}".`
	};
}
