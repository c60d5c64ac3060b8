import { describe, expect, it } from 'vitest';
import { KEPT_ENTRIES, keptView, newerView, type JobView } from './last-seen';
import type { BenchStep, EntryView } from './types';

const entry = (seq: number, id = `e${seq}`) => ({ id, seq }) as unknown as EntryView;
const step = (id: string, done: boolean) => ({ id, done }) as unknown as BenchStep;
const view = (entries: EntryView[], done = false, jobId = 'job-1'): JobView => ({
	jobId,
	steps: [step('s1', done)],
	entries,
	redos: [],
	nextBefore: null
});

describe('newerView', () => {
	it('keeps the page when nothing newer was seen on the device', () => {
		const page = view([entry(3), entry(2)]);
		expect(newerView(page, null)).toBeNull();
		expect(newerView(page, view([entry(2)]))).toBeNull();
		expect(newerView(page, view([entry(3), entry(2)]))).toBeNull();
	});

	it('shows what the device saw after an older page was kept, merged by id, newest first', () => {
		const page = view([entry(3), entry(2)]);
		const kept = view([entry(5), entry(4), entry(3)], true);
		const shown = newerView(page, kept);
		expect(shown?.entries.map((e) => e.seq)).toEqual([5, 4, 3, 2]);
		expect(shown?.steps[0].done).toBe(true);
	});

	it('never mixes jobs and ignores rubbish kept on the device', () => {
		expect(newerView(view([entry(1)]), view([entry(9)], true, 'job-2'))).toBeNull();
		const broken = { jobId: 'job-1', entries: 'x' } as unknown as JobView;
		expect(newerView(view([entry(1)]), broken)).toBeNull();
	});
});

describe('keptView', () => {
	it('keeps only the newest entries', () => {
		const many = Array.from({ length: KEPT_ENTRIES + 20 }, (_, i) => entry(1000 - i));
		const kept = keptView(view(many));
		expect(kept.entries).toHaveLength(KEPT_ENTRIES);
		expect(kept.entries[0].seq).toBe(1000);
	});
});
