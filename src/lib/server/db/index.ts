import { building } from '$app/environment';
import { env } from '$env/dynamic/private';
import { drizzle } from 'drizzle-orm/postgres-js';
import postgres from 'postgres';
import * as schema from './schema';

const url = env.DATABASE_URL;
if (!url && !building) {
	throw new Error('DATABASE_URL is not set: start Benchcall with `npm start` or see .env.example');
}

/** postgres.js connects lazily, so the build (which imports this module) never opens a connection. */
export const client = postgres(url ?? 'postgres://127.0.0.1/unset', {
	max: Number(env.DATABASE_POOL_SIZE ?? 10),
	onnotice: () => {},
	connection: { application_name: 'benchcall' },
	// Seconds before a lost connection is tried again. postgres.js's default grows to 20 s after
	// a few failed tries (the count is shared by the pool), so after a short restart of the
	// database some requests waited that long; the database is local: retry within 2 s.
	backoff: (retries: number) => Math.min(0.1 * 2 ** retries, 2),
	// Seconds a new connection may take. The default, 30 s, let requests made while the database
	// restarted hang for 35–39 s (test:faults: a stopped server then waited for them past its
	// 10 s); the database is local and connects in milliseconds, so a slow connect is a failed
	// one: CONNECT_TIMEOUT answers 503 with Retry-After (db/errors.ts) and the outbox tries again.
	connect_timeout: 5
});

export const db = drizzle(client, { schema });
export type Db = typeof db;
export type Tx = Parameters<Parameters<typeof db.transaction>[0]>[0];

// adapter-node emits this on SIGINT/SIGTERM once in-flight requests are done; an open pool
// would otherwise keep `node build` alive (STACK.md, trap 2).
process.on('sveltekit:shutdown', () => {
	void client.end({ timeout: 2 });
	// Requests are done and the pools are ending. A driver socket that lingers (seen after the
	// database had restarted: a socket to PostgreSQL still open 9 s after the pools were told to
	// end) must not keep a stopped server running: exit once the pools have had their 2 s.
	setTimeout(() => {
		const open = process.getActiveResourcesInfo().filter((r) => r !== 'Timeout');
		console.error(`stopped: still open 3 s after shutdown (${open.join(', ')}); exiting`);
		process.exit(0);
	}, 3_000).unref();
});
