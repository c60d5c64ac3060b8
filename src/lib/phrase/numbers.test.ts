import { describe, expect, it } from 'vitest';
import { digitsToDecimal, findNumbers, wordsToNumber } from './numbers';
import { normalizeText, tokenize } from './text';

describe('wordsToNumber', () => {
	const cases: [string, number][] = [
		['twenty four point five', 24.5],
		['twenty-four point five', 24.5],
		['one point two', 1.2],
		['zero point one', 0.1],
		['a hundred and ten', 110],
		['one hundred ten', 110],
		['two point three five', 2.35],
		['point five', 0.5],
		['zero point oh five', 0.05],
		['nought point two five', 0.25],
		['point twenty five', 0.25],
		['thirty five', 35],
		['eighty', 80],
		['fourteen hundred', 1400],
		['one thousand four hundred', 1400],
		['two thousand and fifty', 2050],
		['one and a half', 1.5],
		['minus five', -5],
		['24 point 5', 24.5],
		['nineteen', 19],
		['zero', 0]
	];
	it.each(cases)('%s → %d', (words, value) => {
		expect(wordsToNumber(words)).toBe(value);
	});

	it('gives exact decimals, no float noise', () => {
		// 2.35 read via float arithmetic (2 + 0.3 + 0.05) would be 2.3499999999999996
		expect(2 + 0.3 + 0.05).not.toBe(2.35);
		expect(wordsToNumber('two point three five')).toBe(2.35);
		expect(wordsToNumber('zero point one two')).toBe(0.12);
		expect(wordsToNumber('one point one')).toBe(1.1);
	});

	it('rejects what is not one number', () => {
		for (const w of ['', 'five six', 'twenty twenty', 'hundred', 'point', 'and', 'oh', 'bolt']) {
			expect(wordsToNumber(w), w).toBeNull();
		}
	});
});

describe('digit forms', () => {
	it('reads decimal points, decimal commas and thousands', () => {
		expect(digitsToDecimal('24.5')).toBe('24.5');
		expect(digitsToDecimal('0,85')).toBe('0.85');
		expect(digitsToDecimal('.5')).toBe('0.5');
		expect(digitsToDecimal('-3')).toBe('-3');
		expect(digitsToDecimal('1,500')).toBe('1500');
		expect(digitsToDecimal('0,850')).toBe('0.850');
		expect(digitsToDecimal('abc')).toBeNull();
	});
});

describe('findNumbers in a phrase', () => {
	const spans = (s: string) => findNumbers(tokenize(normalizeText(s))).map((x) => x.value);
	it('finds every number, left to right', () => {
		expect(spans('cylinder two intake zero point one two')).toEqual([2, 0.12]);
		expect(spans('head nuts 22 nm')).toEqual([22]);
		expect(spans('oil 1.1l')).toEqual([1.1]);
		expect(spans('fork oil 0,85 l')).toEqual([0.85]);
		expect(spans('idle speed 1,400 rpm')).toEqual([1400]);
		expect(spans('no numbers here')).toEqual([]);
		// an oil grade is not a number
		expect(spans('oil 10w-30 1.2 litres')).toEqual([1.2]);
	});
});
