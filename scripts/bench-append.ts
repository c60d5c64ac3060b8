/**
 * Append benchmark: the built app and the local PostgreSQL; autocannon with
 * 50 concurrent signed-in clients (one session cookie per connection) posting entries for 20 s,
 * each request a new device-made id; then, on the same database, the raw single-row INSERT rate
 * of log_entry from a plain postgres.js loop with the same concurrency, and the ratio. It prints
 * measured figures only; nothing is asserted. Goal: p99 ≤ 30 ms, rate ≥ 50 % of the raw rate.
 * Runs on its own scratch database (benchcall_bench, made anew each run), never on the demo one.
 *
 * For scale it also measures, for BENCH_IDLE_SECONDS (5; 0 skips), the same server answering
 * signed-in API requests that do nothing (the job log of a job id that cannot exist: session,
 * route, query check, then a JSON 404, no database): no endpoint of this server can beat that
 * rate or latency on this machine.
 *
 *   npm run bench:append            (BENCH_SECONDS=5 for a short run; BENCH_WARMUP_SECONDS=2)
 */
import { spawn } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { loadavg } from 'node:os';
import autocannon from 'autocannon';
import postgres from 'postgres';
import { ensureBuild } from './lib/build.js';
import { demoPassword } from './lib/demo.js';
import { prepareDatabase } from './lib/prepare.js';

const CLIENTS = 50;
const SECONDS = Number(process.env.BENCH_SECONDS ?? 20);
// A short run first, not counted: the server's first requests compile code and fill caches.
const WARMUP = Number(process.env.BENCH_WARMUP_SECONDS ?? 2);
const IDLE = Number(process.env.BENCH_IDLE_SECONDS ?? 5);
const PORT = Number(process.env.BENCH_PORT ?? 4199);
const base = `http://127.0.0.1:${PORT}`;
const load = () =>
	loadavg()
		.map((l) => l.toFixed(2))
		.join(', ');

const url = await prepareDatabase('benchcall_bench', { fresh: true });
// BENCH_BUILD_DIR: serve a copy of a build made earlier instead of building now.
const buildDir = process.env.BENCH_BUILD_DIR;
if (!buildDir) await ensureBuild();
const server = spawn(process.execPath, [buildDir ?? 'build'], {
	env: { ...process.env, DATABASE_URL: url, PORT: String(PORT), HOST: '127.0.0.1', ORIGIN: base },
	stdio: ['ignore', 'ignore', 'inherit']
});
const stop = () => server.kill('SIGTERM');
process.on('exit', stop);

for (let i = 0; i < 100; i++) {
	try {
		if ((await fetch(`${base}/sign-in`)).ok) break;
	} catch {
		// not up yet
	}
	await new Promise((r) => setTimeout(r, 200));
}

const sql = postgres(url, { max: CLIENTS, onnotice: () => {} });
const [job] = await sql`select j.id, j.shop_id, j.technician_id from job j where j.number = 1042
	and j.shop_id = (select shop_id from "user" where email = 'tomasz@kettlestreet.test')`;

async function signIn(): Promise<string> {
	const res = await fetch(`${base}/sign-in`, {
		method: 'POST',
		redirect: 'manual',
		headers: { origin: base, 'content-type': 'application/x-www-form-urlencoded' },
		body: new URLSearchParams({ email: 'tomasz@kettlestreet.test', password: demoPassword })
	});
	const cookie = res.headers.getSetCookie().find((c) => c.startsWith('benchcall_session='));
	if (!cookie) throw new Error(`sign-in failed (${res.status})`);
	return cookie.split(';')[0];
}
const cookies: string[] = [];
for (let i = 0; i < CLIENTS; i++) cookies.push(await signIn());

const phrases = ['lower mount 55 nm', 'front mount 3.3 kgf m', 'muffler bolt 20', 'note checked'];

/** An autocannon run of CLIENTS connections, each signed in as its own session. */
function cannon(
	seconds: number,
	headers: Record<string, string>,
	requests: autocannon.Request[]
): Promise<autocannon.Result> {
	let next = 0;
	return autocannon({
		url: base,
		connections: CLIENTS,
		duration: seconds,
		setupClient: (client) => {
			client.setHeaders({ ...headers, cookie: cookies[next++ % cookies.length] });
		},
		requests
	});
}

/** Entries posted, a new entry id per request. */
function post(seconds: number): Promise<autocannon.Result> {
	return cannon(seconds, { 'content-type': 'application/json', accept: 'application/json' }, [
		{
			method: 'POST',
			path: `/api/jobs/${job.id}/entries`,
			setupRequest: (req) => ({
				...req,
				body: JSON.stringify({
					id: randomUUID(),
					text: phrases[Math.floor(Math.random() * phrases.length)],
					source: 'typed'
				})
			})
		}
	]);
}

/**
 * Signed-in API requests that do nothing: the session, then a JSON 404 for a job id that is not a
 * uuid, decided before any query. (An unknown path would render the HTML error page instead.)
 */
function idle(seconds: number): Promise<autocannon.Result> {
	return cannon(seconds, { accept: 'application/json' }, [
		{ method: 'GET', path: '/api/jobs/no-such-job/entries' }
	]);
}

const count = async () =>
	(await sql`select count(*)::int as n from log_entry where job_id = ${job.id}`)[0].n as number;

if (WARMUP > 0) await post(WARMUP);
const loadBefore = load();
const before = await count();
const run = await post(SECONDS);
const stored = (await count()) - before;
const loadAfter = load();
const created = run.statusCodeStats?.['201']?.count ?? 0;
const others = Object.entries(run.statusCodeStats ?? {})
	.filter(([code]) => code !== '201')
	.map(([code, s]) => `${s.count ?? 0} × ${code}`);
const appRate = created / SECONDS;
const nothing = IDLE > 0 ? await idle(IDLE) : null;
const nothingRate = (nothing?.statusCodeStats?.['404']?.count ?? 0) / IDLE;

// The raw rate: single-row INSERTs of the same table, same concurrency, same duration.
let raw = 0;
const until = Date.now() + SECONDS * 1000;
await Promise.all(
	Array.from({ length: CLIENTS }, async () => {
		while (Date.now() < until) {
			await sql`insert into log_entry (id, shop_id, job_id, author_id, kind, raw_text, source,
				value, unit, spec_value, spec_unit, verdict, occurred_at)
				values (${randomUUID()}, ${job.shop_id}, ${job.id}, ${job.technician_id}, 'measure',
				'lower mount 55 nm', 'typed', 55, 'N.m', 55, 'N.m', 'in', now())`;
			raw++;
		}
	})
);
const rawRate = raw / SECONDS;

console.log(
	`\nAppend benchmark: autocannon, ${CLIENTS} signed-in clients, ${SECONDS} s (after ${WARMUP} s warm-up), built app on ${base}`
);
console.log(
	`  answers:        ${created} × 201 stored (${stored} new rows in log_entry)` +
		(others.length ? `; other: ${others.join(', ')}` : '') +
		(run.errors || run.timeouts ? `; ${run.errors} errors, ${run.timeouts} timeouts` : '')
);
console.log(`  entries/s:      ${appRate.toFixed(0)}`);
console.log(
	`  latency:        p50 ${run.latency.p50} ms · p99 ${run.latency.p99} ms · max ${run.latency.max} ms (goal p99 ≤ 30 ms)`
);
console.log(`  raw INSERT/s:   ${rawRate.toFixed(0)} (postgres.js, ${CLIENTS} concurrent)`);
console.log(
	`  ratio:          ${((appRate / rawRate) * 100).toFixed(1)} % of the raw rate (goal ≥ 50 %)`
);
if (nothing) {
	console.log(
		`  for scale:      ${nothingRate.toFixed(0)} signed-in API requests/s that do nothing (session, JSON 404), p50 ${nothing.latency.p50} ms · p99 ${nothing.latency.p99} ms, ${IDLE} s: ${((nothingRate / rawRate) * 100).toFixed(1)} % of the raw rate`
	);
}
console.log(`  load average:   ${loadBefore} before the run, ${loadAfter} after (1, 5, 15 min)`);
await sql.end();
stop();
process.exit(0);
