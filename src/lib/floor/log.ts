// The running log on the Floor: the row shape, the filters and the merge of live entries into a
// list. Pure: the server pages the history with the same filter; the browser applies it to live
// entries and merges them without gaps or repeats.

export type Verdict = 'in' | 'low' | 'high' | 'no_spec';

export interface FloorEntry {
	id: string;
	seq: number;
	jobId: string;
	jobNumber: number;
	bay: string | null;
	authorId: string;
	authorName: string;
	kind: string;
	rawText: string;
	value: number | null;
	unit: string | null;
	specValue: number | null;
	specUnit: string | null;
	verdict: Verdict | null;
	note: string | null;
	stepLabel: string | null;
	retracts: string | null;
	respondsTo: string | null;
	/** ISO 8601. */
	occurredAt: string;
}

export interface LogFilter {
	bay?: string;
	technician?: string;
	job?: number;
	verdict?: Verdict | 'out';
	q?: string;
}

/** The filter from validated query values: empty means "any". */
export function normalizeFilter(input: {
	bay?: string;
	technician?: string;
	job?: string;
	verdict?: string;
	q?: string;
}): LogFilter {
	const f: LogFilter = {};
	if (input.bay) f.bay = input.bay;
	if (input.technician) f.technician = input.technician;
	if (input.job) f.job = Number(input.job);
	if (input.verdict) f.verdict = input.verdict as LogFilter['verdict'];
	if (input.q) f.q = input.q;
	return f;
}

export function isFiltered(f: LogFilter): boolean {
	return Object.values(f).some((v) => v !== undefined && v !== '');
}

/** Whether a live entry belongs in the list under `f` (the same rules as the server query). */
export function matchesFilter(e: FloorEntry, f: LogFilter): boolean {
	if (f.bay && e.bay !== f.bay) return false;
	if (f.technician && e.authorId !== f.technician) return false;
	if (f.job !== undefined && e.jobNumber !== f.job) return false;
	if (f.verdict === 'out') {
		if (e.verdict !== 'low' && e.verdict !== 'high') return false;
	} else if (f.verdict && e.verdict !== f.verdict) return false;
	if (f.q) {
		const q = f.q.toLowerCase();
		const hay = `${e.rawText} ${e.stepLabel ?? ''}`.toLowerCase();
		if (!hay.includes(q)) return false;
	}
	return true;
}

/**
 * Merges incoming entries into a list kept newest first (by seq). An id already in the list is
 * skipped: the stream re-sends a short window on reconnect, and an entry whose transaction
 * committed late may arrive after entries with a higher seq.
 */
export function mergeEntries(list: FloorEntry[], incoming: FloorEntry[]): FloorEntry[] {
	const seen = new Set(list.map((e) => e.id));
	const fresh = incoming.filter((e) => !seen.has(e.id) && (seen.add(e.id), true));
	if (fresh.length === 0) return list;
	return [...list, ...fresh].sort((a, b) => b.seq - a.seq);
}

/** Query string of a filter, for links and fetches. */
export function filterParams(f: LogFilter): URLSearchParams {
	const p = new URLSearchParams();
	if (f.bay) p.set('bay', f.bay);
	if (f.technician) p.set('technician', f.technician);
	if (f.job !== undefined) p.set('job', String(f.job));
	if (f.verdict) p.set('verdict', f.verdict);
	if (f.q) p.set('q', f.q);
	return p;
}

/** A redo the foreman ordered that the technician has not answered with a new entry yet. */
export interface OpenRedo {
	id: string;
	jobStepId: string;
	stepLabel: string;
	note: string;
	foremanName: string;
	orderedAt: string;
	/** What was logged before (the value the redo answers). */
	previous: string | null;
}
