// Where the Floor's live stream resumes. Each event's SSE `id:` carries it and the browser sends
// it back (Last-Event-ID, or `?after=` when the page opens a new stream).
//
// A catch-up re-reads the RESCAN_WINDOW seqs below the resume point, because seq is taken at
// insert and a transaction that commits late can carry a lower seq than one already sent. So
// that the re-read sends only what the browser has not had, the id is `<high>.<mark>`: `high`
// is the highest seq sent, and `mark` (base64url) is a bitmap of which of the window's seqs
// below it were sent too (bit i: seq high − i). A plain `<high>` says nothing more is known.
// Pure: used by the stream endpoint and its tests.

/** How far back (in seq) a catch-up re-scans, for transactions that committed late. */
export const RESCAN_WINDOW = 200;

export interface ResumePoint {
	high: number;
	/** Seqs in (high − RESCAN_WINDOW, high] the browser already has. */
	sent: Set<number>;
}

const alphabet = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_';
const bytes = RESCAN_WINDOW / 8;

function toBase64Url(data: Uint8Array): string {
	let out = '';
	for (let i = 0; i < data.length; i += 3) {
		const n = (data[i] << 16) | ((data[i + 1] ?? 0) << 8) | (data[i + 2] ?? 0);
		const chars = Math.ceil((Math.min(3, data.length - i) * 8) / 6);
		for (let k = 0; k < chars; k++) out += alphabet[(n >> (18 - 6 * k)) & 63];
	}
	return out;
}

function fromBase64Url(text: string): Uint8Array | null {
	const out = new Uint8Array(Math.floor((text.length * 6) / 8));
	let acc = 0;
	let bits = 0;
	let o = 0;
	for (const ch of text) {
		const v = alphabet.indexOf(ch);
		if (v < 0) return null;
		acc = (acc << 6) | v;
		bits += 6;
		if (bits >= 8) {
			bits -= 8;
			out[o++] = (acc >> bits) & 255;
		}
	}
	return out;
}

/** The id of an event: the highest seq sent and which seqs of the window below it were sent. */
export function encodeResume(high: number, sent: Iterable<number>): string {
	const mark = new Uint8Array(bytes);
	let any = false;
	for (const seq of sent) {
		const i = high - seq;
		if (i < 0 || i >= RESCAN_WINDOW) continue;
		mark[i >> 3] |= 1 << (i & 7);
		any = true;
	}
	if (!any) return String(high);
	let end = mark.length;
	while (end > 0 && mark[end - 1] === 0) end--;
	return `${high}.${toBase64Url(mark.subarray(0, end))}`;
}

/** Reads a resume point back; null when `raw` is not one (a bad header or query value). */
export function decodeResume(raw: string): ResumePoint | null {
	const m = /^(\d{1,16})(?:\.([A-Za-z0-9_-]{1,34}))?$/.exec(raw.trim());
	if (!m) return null;
	const high = Number(m[1]);
	if (!Number.isSafeInteger(high)) return null;
	const sent = new Set<number>();
	if (m[2]) {
		const mark = fromBase64Url(m[2]);
		if (!mark) return null;
		for (let i = 0; i < Math.min(RESCAN_WINDOW, mark.length * 8); i++) {
			if (mark[i >> 3] & (1 << (i & 7)) && high - i >= 0) sent.add(high - i);
		}
	}
	return { high, sent };
}
