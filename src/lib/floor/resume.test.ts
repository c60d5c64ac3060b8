import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { RESCAN_WINDOW, decodeResume, encodeResume } from './resume';

describe('the Floor stream resume point', () => {
	it('is the plain seq when nothing below it is known (the form ?after= has always had)', () => {
		expect(encodeResume(431, [])).toBe('431');
		expect(decodeResume('431')).toEqual({ high: 431, sent: new Set() });
		expect(decodeResume('0')).toEqual({ high: 0, sent: new Set() });
	});

	it('carries which seqs of the window were sent', () => {
		const id = encodeResume(1000, [1000, 999, 995, 801]);
		expect(id).toMatch(/^1000\.[A-Za-z0-9_-]+$/);
		expect(decodeResume(id)).toEqual({ high: 1000, sent: new Set([1000, 999, 995, 801]) });
	});

	it('drops seqs outside the window, never below zero', () => {
		expect(decodeResume(encodeResume(1000, [800, 1001, 1000]))?.sent).toEqual(new Set([1000]));
		expect(decodeResume(encodeResume(3, [0, 1, 3]))?.sent).toEqual(new Set([0, 1, 3]));
	});

	it('round-trips any set of sent seqs in the window (property)', () => {
		// fast-check (npm reference library for property tests): encode ∘ decode is the identity
		fc.assert(
			fc.property(
				fc.integer({ min: 0, max: 2 ** 40 }),
				fc.uniqueArray(fc.integer({ min: 0, max: RESCAN_WINDOW - 1 }), { maxLength: 60 }),
				(high, offsets) => {
					const sent = new Set(offsets.map((o) => high - o).filter((s) => s >= 0));
					const back = decodeResume(encodeResume(high, sent));
					expect(back?.high).toBe(high);
					expect(back?.sent).toEqual(sent);
				}
			)
		);
	});

	it('stays short enough for a header: at most 16 digits, a dot and 34 characters', () => {
		const all = Array.from({ length: RESCAN_WINDOW }, (_, i) => 10 ** 12 - i);
		expect(encodeResume(10 ** 12, all).length).toBeLessThanOrEqual(13 + 1 + 34);
	});

	it('refuses what is not a resume point', () => {
		for (const bad of [
			'',
			'-1',
			'12.5.6',
			'abc',
			'1e5',
			'12.',
			'12.!!',
			'99999999999999999',
			`1.${'A'.repeat(35)}`
		])
			expect(decodeResume(bad), bad).toBeNull();
	});
});
