import { describe, expect, it } from 'vitest';
import { filterParams, matchesFilter, mergeEntries, normalizeFilter, type FloorEntry } from './log';

function entry(seq: number, over: Partial<FloorEntry> = {}): FloorEntry {
	return {
		id: `e${seq}`,
		seq,
		jobId: 'j1',
		jobNumber: 1042,
		bay: 'Bay 2',
		authorId: 'u1',
		authorName: 'Tech',
		kind: 'measure',
		rawText: 'rear axle 80 nm',
		value: 80,
		unit: 'N.m',
		specValue: 80,
		specUnit: 'N.m',
		verdict: 'in',
		note: null,
		stepLabel: 'Rear axle nut',
		retracts: null,
		respondsTo: null,
		occurredAt: '2026-12-02T10:00:00Z',
		...over
	};
}

describe('matchesFilter', () => {
	it('keeps everything without a filter', () => {
		expect(matchesFilter(entry(1), {})).toBe(true);
	});
	it('filters by bay, technician, job and step text', () => {
		expect(matchesFilter(entry(1), { bay: 'Bay 2' })).toBe(true);
		expect(matchesFilter(entry(1), { bay: 'Bay 3' })).toBe(false);
		expect(matchesFilter(entry(1), { technician: 'u2' })).toBe(false);
		expect(matchesFilter(entry(1), { job: 1042 })).toBe(true);
		expect(matchesFilter(entry(1), { job: 1043 })).toBe(false);
		expect(matchesFilter(entry(1), { q: 'AXLE' })).toBe(true);
		expect(
			matchesFilter(entry(1, { rawText: 'done', stepLabel: 'Test ride' }), { q: 'ride' })
		).toBe(true);
		expect(matchesFilter(entry(1), { q: 'sprocket' })).toBe(false);
	});
	it('treats "out" as under or over', () => {
		expect(matchesFilter(entry(1, { verdict: 'low' }), { verdict: 'out' })).toBe(true);
		expect(matchesFilter(entry(1, { verdict: 'high' }), { verdict: 'out' })).toBe(true);
		expect(matchesFilter(entry(1, { verdict: 'in' }), { verdict: 'out' })).toBe(false);
		expect(matchesFilter(entry(1, { verdict: null }), { verdict: 'out' })).toBe(false);
		expect(matchesFilter(entry(1, { verdict: 'high' }), { verdict: 'low' })).toBe(false);
	});
});

describe('mergeEntries', () => {
	it('keeps newest first and skips repeats of an id', () => {
		const list = [entry(5), entry(4)];
		const merged = mergeEntries(list, [entry(6), entry(5), entry(6)]);
		expect(merged.map((e) => e.seq)).toEqual([6, 5, 4]);
	});
	it('places a late-committed entry with a lower seq in order', () => {
		const merged = mergeEntries([entry(9), entry(7)], [entry(8)]);
		expect(merged.map((e) => e.seq)).toEqual([9, 8, 7]);
	});
	it('returns the same list when nothing is new', () => {
		const list = [entry(2)];
		expect(mergeEntries(list, [entry(2)])).toBe(list);
	});
});

describe('normalizeFilter and filterParams', () => {
	it('round-trips the set filters and drops empty ones', () => {
		const f = normalizeFilter({ bay: 'Bay 1', technician: '', job: '1042', verdict: 'out', q: '' });
		expect(f).toEqual({ bay: 'Bay 1', job: 1042, verdict: 'out' });
		expect(filterParams(f).toString()).toBe('bay=Bay+1&job=1042&verdict=out');
	});
});
