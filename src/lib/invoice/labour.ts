// Clock-time labour from the job log. Pure.
//
// Per technician: time runs from their first entry to their last, and any gap between two
// consecutive entries that is longer than the shop's idle gap is left out (lunch, waiting for
// parts, another job). A technician with a single entry has no measurable time: 0.

export interface TimedEntry {
	authorId: string;
	occurredAt: Date;
}

export interface ClockTime {
	authorId: string;
	/** Worked time in milliseconds, idle gaps left out. */
	ms: number;
	/** Hours to bill, rounded to the nearest hundredth (halves up). */
	hours: number;
	first: Date;
	last: Date;
	/** Gaps left out because they were longer than the idle gap. */
	gapsLeftOut: number;
}

/** Milliseconds to hours in hundredths, halves up: 45 min → 0.75 h, 20 min → 0.33 h. */
export function msToHours(ms: number): number {
	return Math.round(ms / 36_000) / 100;
}

/** Worked time of one person from their entry times. */
export function workedMs(
	times: readonly Date[],
	idleGapMinutes: number
): { ms: number; gaps: number } {
	if (!Number.isFinite(idleGapMinutes) || idleGapMinutes < 0) {
		throw new Error('The idle gap must be zero or more minutes');
	}
	const sorted = times.map((t) => t.getTime()).sort((a, b) => a - b);
	const limit = idleGapMinutes * 60_000;
	let ms = 0;
	let gaps = 0;
	for (let i = 1; i < sorted.length; i++) {
		const d = sorted[i] - sorted[i - 1];
		if (d > limit) gaps++;
		else ms += d;
	}
	return { ms, gaps };
}

/** Clock time per technician, in the order each first appears in the log. */
export function clockTime(entries: readonly TimedEntry[], idleGapMinutes: number): ClockTime[] {
	const byAuthor = new Map<string, Date[]>();
	for (const e of entries) {
		const list = byAuthor.get(e.authorId) ?? [];
		list.push(e.occurredAt);
		byAuthor.set(e.authorId, list);
	}
	const out: ClockTime[] = [];
	for (const [authorId, times] of byAuthor) {
		const { ms, gaps } = workedMs(times, idleGapMinutes);
		const sorted = [...times].sort((a, b) => a.getTime() - b.getTime());
		out.push({
			authorId,
			ms,
			hours: msToHours(ms),
			first: sorted[0],
			last: sorted[sorted.length - 1],
			gapsLeftOut: gaps
		});
	}
	return out.sort((a, b) => a.first.getTime() - b.first.getTime());
}
