// Small formatting helpers for job boards. Pure.

/** "12 min", "3 h 5 min", "2 d": compact time since, for boards. */
export function sinceLabel(from: Date | null, now: Date): string {
	if (!from) return '—';
	const minutes = Math.max(0, Math.floor((now.getTime() - from.getTime()) / 60_000));
	if (minutes < 1) return 'just now';
	if (minutes < 60) return `${minutes} min`;
	const hours = Math.floor(minutes / 60);
	if (hours < 24) return minutes % 60 ? `${hours} h ${minutes % 60} min` : `${hours} h`;
	return `${Math.floor(hours / 24)} d`;
}
