// The Bench "as last seen": a page kept by the service worker shows the job as it was when the
// page was loaded, but entries arrive afterwards (typed, from others, by the live stream). The
// Bench keeps its latest view of each job on the device and, when a page it is given is older
// than that view (an offline reload), shows the newer one. Pure: storage is the caller's.
import type { OpenRedo } from '$lib/floor/log';
import type { BenchStep, EntryView } from './types';

export interface JobView {
	jobId: string;
	steps: BenchStep[];
	/** Newest first, as the job log shows them. */
	entries: EntryView[];
	redos: OpenRedo[];
	nextBefore: number | null;
}

/** How many entries a kept view holds: the first page of the log and then some. */
export const KEPT_ENTRIES = 100;

const newestSeq = (entries: readonly EntryView[]) =>
	entries.reduce((m, e) => Math.max(m, e.seq), 0);

/**
 * The view to show: `page` when it is as new as what was kept (a page from the server wins),
 * otherwise `kept` with the page's entries merged in by id. The log is append-only, so an entry
 * the device saw is never wrong, only possibly missing from an older page.
 */
export function newerView(page: JobView, kept: JobView | null | undefined): JobView | null {
	if (!kept || kept.jobId !== page.jobId) return null;
	if (!Array.isArray(kept.entries) || !Array.isArray(kept.steps)) return null;
	if (newestSeq(kept.entries) <= newestSeq(page.entries)) return null;
	const byId = new Map<string, EntryView>();
	for (const e of [...page.entries, ...kept.entries]) byId.set(e.id, e);
	return {
		jobId: page.jobId,
		steps: kept.steps,
		entries: [...byId.values()].sort((a, b) => b.seq - a.seq),
		redos: Array.isArray(kept.redos) ? kept.redos : page.redos,
		nextBefore: page.nextBefore
	};
}

/** What is kept of a view: the newest entries only. */
export function keptView(view: JobView): JobView {
	return { ...view, entries: view.entries.slice(0, KEPT_ENTRIES) };
}
