import { describe, expect, it } from 'vitest';
import { liveEntries, retractedIds } from './live';

const e = (id: string, kind = 'measure', retracts: string | null = null) => ({
	id,
	kind,
	retracts
});

describe('live entries', () => {
	it('leaves out what a retraction withdraws, and the retraction itself', () => {
		const log = [e('a'), e('b'), e('r', 'retraction', 'a'), e('c', 'note')];
		expect(retractedIds(log)).toEqual(new Set(['a']));
		expect(liveEntries(log).map((x) => x.id)).toEqual(['b', 'c']);
	});

	it('counts only retractions: another kind pointing nowhere withdraws nothing', () => {
		const log = [e('a'), e('x', 'accept', 'a')];
		expect(liveEntries(log).map((x) => x.id)).toEqual(['a', 'x']);
	});
});
