// The database driver across a lost connection (a PostgreSQL restart, an administrator ending a
// session). postgres.js 3.4.9 mishandles this in three ways, patched in
// scripts/patches/postgres+3.4.9.patch (applied by `npm ci` through patch-package); each test
// below fails on the unpatched driver. Upstream reports: porsager/postgres issues 1154 and 1208
// (the crash), and the unguarded write after close that pull request 1209 describes.
import postgres from 'postgres';
import { afterAll, describe, expect, it } from 'vitest';

const url = process.env.DATABASE_URL ?? '';
const admin = postgres(url, { max: 1, onnotice: () => {} });
afterAll(() => admin.end({ timeout: 1 }));

const within = <T>(p: Promise<T>, ms = 5000) =>
	Promise.race([
		p,
		new Promise<never>((_, reject) =>
			setTimeout(() => reject(new Error(`no answer within ${ms} ms`)), ms)
		)
	]);

/** Ends the server session behind `pid`, as a fast shutdown of PostgreSQL does to every one. */
const endSession = (pid: number) => admin`select pg_terminate_backend(${pid})`;

describe('postgres.js after the server ends a session', () => {
	it('rejects the next query of a lost transaction: no crash, no query left waiting', async () => {
		// Unpatched, the query below is written to a socket that is gone: either a TypeError thrown
		// from setImmediate, which no try/catch can reach, ends the whole Node.js process, or (when
		// a write was pending at the close) the query waits forever.
		const sql = postgres(url, { max: 2, onnotice: () => {} });
		const box: { late?: Promise<string>; done?: () => void } = {};
		const callbackDone = new Promise<void>((r) => (box.done = r));
		try {
			const outcome = await within(
				sql
					.begin(async (tx) => {
						const [{ pid }] = await tx`select pg_backend_pid() as pid`;
						await endSession(pid);
						await new Promise((r) => setTimeout(r, 300));
						box.late = tx`select 2`.then(
							() => 'answered',
							(e: { code?: string }) => e.code ?? 'failed'
						);
						await box.late.finally(box.done);
					})
					.then(
						() => 'committed',
						(e: { code?: string }) => e.code
					)
			);
			expect(outcome).toBe('CONNECTION_CLOSED');
			// the callback goes on after its transaction has failed; wait for its last query
			await within(callbackDone);
			expect(await within(box.late ?? Promise.resolve('never sent'))).toBe('CONNECTION_CLOSED');
			const [row] = await within(sql`select 3 as x`);
			expect(row.x).toBe(3);
		} finally {
			await sql.end({ timeout: 1 });
		}
	});

	it("does not fail the next connection's first query with the old session's error", async () => {
		// Unpatched, the "terminating connection" error of the lost session stays on the connection
		// object and is handed to the first query of the next session, on a healthy server.
		const sql = postgres(url, { max: 1, onnotice: () => {} });
		try {
			const [{ pid }] = await sql`select pg_backend_pid() as pid`;
			const slow = sql`select pg_sleep(5)`.then(
				() => 'answered',
				(e: { code?: string }) => e.code
			);
			await new Promise((r) => setTimeout(r, 100));
			await endSession(pid);
			expect(await within(slow)).toBe('CONNECTION_CLOSED');
			const [row] = await within(sql`select 1 as x`);
			expect(row.x).toBe(1);
		} finally {
			await sql.end({ timeout: 1 });
		}
	});

	it('never writes the rest of a lost transaction down the reconnected connection', async () => {
		// Unpatched, a transaction whose session ended keeps writing to its connection object while
		// the pool reconnects it for someone else: the other caller's query fails, and a write of
		// the dead transaction could run outside any transaction.
		const sql = postgres(url, { max: 1, onnotice: () => {} });
		const marker = `driver-test-${crypto.randomUUID()}`;
		try {
			const box: { late?: Promise<string>; done?: () => void } = {};
			const callbackDone = new Promise<void>((r) => (box.done = r));
			const tx = sql
				.begin(async (tx) => {
					const [{ pid }] = await tx`select pg_backend_pid() as pid`;
					const slow = tx`select pg_sleep(5)`;
					await endSession(pid);
					await slow.catch(() => {});
					await new Promise((r) => setTimeout(r, 50));
					box.late = tx`insert into shop (name) values (${marker}) returning name`.then(
						() => 'written',
						(e: { code?: string }) => e.code ?? 'failed'
					);
					await box.late.finally(box.done);
				})
				.then(
					() => 'committed',
					(e: { code?: string }) => e.code
				);
			expect(await within(tx)).toBe('CONNECTION_CLOSED');
			const [row] = await within(sql`select 42 as x`);
			expect(row.x).toBe(42);
			// the callback goes on after its transaction has failed; wait for its last query
			await within(callbackDone);
			expect(await within(box.late ?? Promise.resolve('never sent'))).toBe('CONNECTION_CLOSED');
			const [{ n }] = await admin`select count(*)::int as n from shop where name = ${marker}`;
			expect(n).toBe(0);
		} finally {
			await sql.end({ timeout: 1 });
		}
	});
});
