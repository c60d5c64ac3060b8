// The Bench's browser side of "no entry lost": the pure queue wired to IndexedDB (idb-keyval)
// and fetch. Imported only from the Bench page.
import { createStore, get, set } from 'idb-keyval';
import { AUTHOR_HEADER } from '$lib/schemas/bench';
import { keptView, type JobView } from './last-seen';
import { EntryQueue, outcomeOfStatus, type QueuedEntry, type QueueOptions } from './queue';

const KEY = 'waiting-entries';

/** A v4 UUID also where crypto.randomUUID is missing (plain http on a shop network). */
export function newId(): string {
	if (typeof crypto.randomUUID === 'function') return crypto.randomUUID();
	const b = crypto.getRandomValues(new Uint8Array(16));
	b[6] = (b[6] & 0x0f) | 0x40;
	b[8] = (b[8] & 0x3f) | 0x80;
	const h = [...b].map((x) => x.toString(16).padStart(2, '0')).join('');
	return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}

/** When an entry is made: the device's clock, kept with the entry while it waits. */
export const nowIso = () => new Date().toISOString();

/** Sends one waiting entry to the entries endpoint. */
export async function sendEntry(e: QueuedEntry) {
	let res: Response;
	try {
		res = await fetch(`/api/jobs/${e.jobId}/entries`, {
			method: 'POST',
			headers: {
				'content-type': 'application/json',
				accept: 'application/json',
				...(e.authorId ? { [AUTHOR_HEADER]: e.authorId } : {})
			},
			body: JSON.stringify({
				id: e.id,
				text: e.text,
				source: e.source,
				occurredAt: e.occurredAt,
				torqueToolId: e.torqueToolId ?? undefined,
				adapterMm: e.adapterMm ?? undefined,
				stepId: e.stepId,
				retracts: e.retracts
			})
		});
	} catch {
		return outcomeOfStatus(
			0,
			'Not sent: no connection. It stays on this device and is sent later.'
		);
	}
	const body: unknown = await res.json().catch(() => null);
	const said = body && typeof body === 'object' && 'message' in body ? String(body.message) : '';
	const message = said || `The server answered ${res.status}.`;
	// someone else is signed in on this device now: the entry waits for its author
	if (res.status === 409 && body && typeof body === 'object' && 'code' in body) {
		if (body.code === 'other_account') return { kind: 'retry' as const, message, status: 409 };
	}
	if (res.status === 401) {
		return outcomeOfStatus(
			401,
			'Signed out: sign in again on this device and the waiting entries are sent under your name.'
		);
	}
	return outcomeOfStatus(res.status, message, body);
}

/** The queue on IndexedDB, one store per signed-in user so accounts never mix. */
export function browserQueue(userId: string, opts: Omit<QueueOptions, 'storage' | 'send'>) {
	const store = createStore(`benchcall-${userId}`, 'outbox');
	return new EntryQueue({
		...opts,
		send: sendEntry,
		storage: {
			load: () => get<QueuedEntry[]>(KEY, store),
			save: (entries) => set(KEY, entries, store)
		}
	});
}

/** The Bench's latest view of a job, kept on the device for an offline reload. */
export function lastSeen(userId: string) {
	const store = createStore(`benchcall-${userId}`, 'outbox');
	const key = (jobId: string) => `last-seen:${jobId}`;
	return {
		load: (jobId: string) => get<JobView>(key(jobId), store).catch(() => undefined),
		save: (view: JobView) => set(key(view.jobId), keptView(view), store).catch(() => undefined)
	};
}
