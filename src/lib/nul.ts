// PostgreSQL's text cannot hold the NUL character (U+0000): a string with one reaches the
// database as an error, which would be a 500. Pure: the request readers and the URL hook ask
// this first and answer 400 instead.

/** Whether `value` — a string, or any string inside arrays and plain objects (keys too) — has a NUL. */
export function hasNul(value: unknown): boolean {
	if (typeof value === 'string') return value.includes('\u0000');
	if (Array.isArray(value)) return value.some(hasNul);
	if (value !== null && typeof value === 'object') {
		return Object.entries(value).some(([k, v]) => k.includes('\u0000') || hasNul(v));
	}
	return false;
}

export const nulMessage =
	'The text has a NUL character (U+0000), which Benchcall cannot store. Remove it and send again.';
