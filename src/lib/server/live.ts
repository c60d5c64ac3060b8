// The live hub: one LISTEN connection per server process, fanned out in memory by shop.
//
// Each app server announces the log entries it commits on the `log_entry` channel
// (announce.ts), so an entry written through any app server reaches the browsers of every
// server. The payload carries ids only; subscribers read the entry, scoped by shop.
//
// NOTIFY is lost while a listener is disconnected. postgres.js re-listens after a dropped
// connection but gives up silently when the database is away at that moment, so a heartbeat
// (a NOTIFY on our own ping channel every few seconds) proves the connection; when it goes
// quiet the connection is replaced. Every (re)connection, the first too, tells subscribers to
// resync, i.e. catch up from the database, which is the only source of truth.
import { building } from '$app/environment';
import { env } from '$env/dynamic/private';
import postgres from 'postgres';
import { entryChannel as channel, type LiveEvent } from './announce';
import { client } from './db';

export type { LiveEvent };

interface Subscriber {
	onEvent: (e: LiveEvent) => void;
	onResync?: () => void;
	onClose?: () => void;
}

const pingChannel = 'benchcall_live_ping';
const pingEveryMs = 5_000;
const quietLimitMs = 20_000;

const byShop = new Map<string, Set<Subscriber>>();
let conn: postgres.Sql | null = null;
let connecting = false;
let lastSign = 0;
let timer: ReturnType<typeof setInterval> | null = null;
let closed = false;

function parse(payload: string): LiveEvent | null {
	try {
		const v = JSON.parse(payload) as Record<string, unknown>;
		if (typeof v.id !== 'string' || typeof v.shopId !== 'string') return null;
		return {
			seq: Number(v.seq),
			id: v.id,
			shopId: v.shopId,
			jobId: String(v.jobId),
			kind: String(v.kind)
		};
	} catch {
		return null;
	}
}

function deliver(payload: string) {
	lastSign = Date.now();
	const event = parse(payload);
	if (!event) return;
	for (const s of byShop.get(event.shopId) ?? []) {
		try {
			s.onEvent(event);
		} catch (err) {
			console.error('live: a subscriber failed', err);
		}
	}
}

function resyncAll() {
	for (const set of byShop.values()) {
		for (const s of set) {
			try {
				s.onResync?.();
			} catch (err) {
				console.error('live: a subscriber failed to resync', err);
			}
		}
	}
}

/** Every listening client not yet ended, so a stop ends them all (a replaced one may linger). */
const clients = new Set<postgres.Sql>();

function endClient(sql: postgres.Sql) {
	clients.delete(sql);
	void sql.end({ timeout: 0 }).catch(() => {});
}

async function connect() {
	if (connecting || closed || building) return;
	connecting = true;
	const sql = postgres(env.DATABASE_URL ?? '', {
		max: 1,
		onnotice: () => {},
		connection: { application_name: 'benchcall-live' }
	});
	clients.add(sql);
	try {
		let first = true;
		await sql.listen(channel, deliver, () => {
			lastSign = Date.now();
			// postgres.js calls this again after re-listening on a new connection.
			if (!first) resyncAll();
			first = false;
		});
		await sql.listen(pingChannel, () => {
			lastSign = Date.now();
		});
		if (closed) {
			// the process was asked to stop while this connection was being set up
			endClient(sql);
			return;
		}
		conn = sql;
		// Streams opened before this moment read their catch-up while nothing was listening (on a
		// freshly started server, or while the database was away): what was committed between that
		// read and now was announced to no one here, so every subscriber catches up once more.
		resyncAll();
	} catch (err) {
		if (!closed) console.error('live: cannot listen yet, will retry', (err as Error).message);
		endClient(sql);
	} finally {
		connecting = false;
	}
}

async function tick() {
	if (closed) return;
	if (!conn) {
		await connect();
		return;
	}
	if (Date.now() - lastSign > quietLimitMs) {
		console.error('live: the listening connection went quiet; replacing it');
		const old = conn;
		conn = null;
		endClient(old);
		await connect();
		return;
	}
	try {
		// Like the announcements: a lost ping is harmless, so its commit waits for no disk flush.
		await client`select set_config('synchronous_commit', 'off', true), pg_notify(${pingChannel}, '')`;
	} catch {
		// The database is away; the quiet limit will replace the listener when it is back.
	}
}

function start() {
	if (timer || closed || building) return;
	lastSign = Date.now();
	void connect();
	timer = setInterval(() => void tick(), pingEveryMs);
	timer.unref?.();
}

/**
 * Calls `onEvent` for every log entry committed in `shopId`, from any server process.
 * `onResync` (optional) is called after the listening connection was replaced: events may have
 * been missed, so catch up from the database. `onClose` (optional) is called when this process
 * is asked to stop: end the stream, and the browser reconnects to another server.
 * Returns the function that unsubscribes.
 */
export function subscribe(
	shopId: string,
	onEvent: (e: LiveEvent) => void,
	onResync?: () => void,
	onClose?: () => void
): () => void {
	start();
	const sub: Subscriber = { onEvent, onResync, onClose };
	let set = byShop.get(shopId);
	if (!set) byShop.set(shopId, (set = new Set()));
	set.add(sub);
	return () => {
		const current = byShop.get(shopId);
		if (!current) return;
		current.delete(sub);
		if (current.size === 0) byShop.delete(shopId);
	};
}

/** Whether this process is listening now (for the stream's first message and for tests). */
export function isListening(): boolean {
	return conn !== null;
}

// adapter-node waits for open requests before it shuts down, and a live stream never ends by
// itself: on a stop signal, end the streams so the browsers move to another server.
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
	process.once(signal, () => {
		for (const set of byShop.values()) for (const s of set) s.onClose?.();
		// Alone (no server of adapter-node's listening), keep the signal's default: exit.
		if (process.listenerCount(signal) === 0) process.kill(process.pid, signal);
	});
}

process.on('sveltekit:shutdown', () => {
	closed = true;
	if (timer) clearInterval(timer);
	conn = null;
	for (const sql of [...clients]) endClient(sql);
});
