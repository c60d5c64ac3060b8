// Announcing new log entries to every app server's live hub (live.ts) on the `log_entry`
// channel, after the entry's own transaction has committed.
//
// Why not a trigger inside the inserting transaction (as before drizzle/0006): PostgreSQL makes
// every transaction that sent a NOTIFY take one database-wide lock at commit and hold it until
// its commit record is on disk, so appends that notify commit one disk flush at a time and
// cannot share a flush with each other. Here the entry commits alone (sharing flushes with
// concurrent appends), and the announcement goes out in a transaction of its own that waits
// for no flush (`synchronous_commit` off for that transaction only): losing an announcement in
// a database crash loses no entry, and the live hub's subscribers resync after a reconnect.
// Announcements made while one is on its way are sent together in the next statement.
//
// Every code path that appends to log_entry calls announceEntry() after its commit; an entry
// written outside the app (seed, console) reaches open browsers on their next catch-up.
import { client } from './db';

export const entryChannel = 'log_entry';

/** The payload on the channel: ids only; subscribers read the entry, scoped by shop. */
export interface LiveEvent {
	seq: number;
	id: string;
	shopId: string;
	jobId: string;
	kind: string;
}

/** Notifications per statement; each payload is about 200 bytes (PostgreSQL allows 8000). */
const batchLimit = 500;

const pending: string[] = [];
let sending: Promise<void> | null = null;

async function send(): Promise<void> {
	while (pending.length > 0) {
		const batch = pending.splice(0, batchLimit);
		try {
			await client`
				select set_config('synchronous_commit', 'off', true), pg_notify(${entryChannel}, p)
				from json_array_elements_text(${JSON.stringify(batch)}::json) as p`;
		} catch (err) {
			// The entries are stored; open browsers catch up when their stream reconnects.
			console.error(`live: could not announce ${batch.length} entries`, (err as Error).message);
		}
	}
	sending = null;
}

/**
 * Announces a committed entry. Returns at once; the returned promise settles when this and the
 * announcements queued with it have been sent (tests wait on it, requests need not).
 */
export function announceEntry(event: LiveEvent): Promise<void> {
	pending.push(JSON.stringify(event));
	sending ??= send();
	return sending;
}
