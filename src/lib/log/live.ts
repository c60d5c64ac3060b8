// A live entry is one that no retraction names, and a retraction itself only withdraws: the
// same rule as the server's SQL ($lib/server/log/live.ts), for entries already read into memory
// (one job's log: the invoice draft, the work report).

/** The ids that a retraction among `entries` withdraws. */
export function retractedIds(
	entries: readonly { kind: string; retracts: string | null }[]
): Set<string> {
	const out = new Set<string>();
	for (const e of entries) if (e.kind === 'retraction' && e.retracts) out.add(e.retracts);
	return out;
}

/** Entries that count: not retractions and not withdrawn by one. */
export function liveEntries<T extends { id: string; kind: string; retracts: string | null }>(
	entries: readonly T[]
): T[] {
	const retracted = retractedIds(entries);
	return entries.filter((e) => e.kind !== 'retraction' && !retracted.has(e.id));
}
