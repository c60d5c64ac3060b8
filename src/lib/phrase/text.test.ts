import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { foldText, normalizeText } from './text';

describe('normalizeText', () => {
	it('reads printable ASCII exactly as the full Unicode folding does', () => {
		fc.assert(
			fc.property(fc.string({ unit: 'grapheme-ascii', maxLength: 80 }), (s) => {
				expect(normalizeText(s)).toBe(foldText(s));
			}),
			{ numRuns: 2000 }
		);
		expect(normalizeText('Rear AXLE `80` N*m')).toBe("rear axle '80' n m");
	});

	it('folds what is not ASCII: full-width digits, accents, dashes, the middle dot', () => {
		expect(normalizeText('８０ N·m – Kühler')).toBe('80 n m - kuhler');
		expect(normalizeText('tab\there')).toBe('tab here');
	});
});
