/**
 * Append benchmark: the built app and the local PostgreSQL, 50 signed-in clients posting entries
 * for 20 s (closed-loop fetch clients: autocannon 9 sent requests here but counted no answers);
 * then, on the same database, the raw single-row INSERT rate of log_entry from a plain postgres.js loop with the same concurrency, and the ratio. It prints
 * measured figures only; nothing is asserted. Goal (issue 4): p99 ≤ 30 ms, rate ≥ 50 % of raw.
 * Runs on its own scratch database (benchcall_bench, made anew each run), never on the demo one.
 *
 *   npm run bench:append            (BENCH_SECONDS=5 for a short run)
 */
import { spawn } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { performance } from 'node:perf_hooks';
import postgres from 'postgres';
import { ensureBuild } from './lib/build.js';
import { demoPassword } from './lib/demo.js';
import { prepareDatabase } from './lib/prepare.js';

const CLIENTS = 50;
const SECONDS = Number(process.env.BENCH_SECONDS ?? 20);
const PORT = Number(process.env.BENCH_PORT ?? 4199);
const base = `http://127.0.0.1:${PORT}`;

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

const sql = postgres(url, { max: CLIENTS });
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
// Each client posts its next entry as soon as the last one is answered (closed loop, like
// autocannon's connections); every latency is kept for the percentiles.
const latencies: number[] = [];
let ok = 0;
let failed = 0;
const stopAt = Date.now() + SECONDS * 1000;
await Promise.all(
	cookies.map(async (cookie) => {
		while (Date.now() < stopAt) {
			const started = performance.now();
			const res = await fetch(`${base}/api/jobs/${job.id}/entries`, {
				method: 'POST',
				headers: { 'content-type': 'application/json', accept: 'application/json', cookie },
				body: JSON.stringify({
					id: randomUUID(),
					text: phrases[Math.floor(Math.random() * phrases.length)],
					source: 'typed'
				})
			});
			await res.arrayBuffer();
			latencies.push(performance.now() - started);
			if (res.status === 201) ok++;
			else failed++;
		}
	})
);
latencies.sort((a, b) => a - b);
const pct = (p: number) =>
	latencies[Math.min(latencies.length - 1, Math.floor(p * latencies.length))] ?? 0;
const appRate = ok / SECONDS;

// the raw rate: single-row INSERTs of the same table, same concurrency, same duration
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

console.log(`\nAppend benchmark: ${CLIENTS} signed-in clients, ${SECONDS} s, built app on ${base}`);
console.log(`  entries stored: ${ok} (other answers: ${failed})`);
console.log(`  entries/s:      ${appRate.toFixed(0)}`);
console.log(
	`  latency:        p50 ${pct(0.5).toFixed(1)} ms · p99 ${pct(0.99).toFixed(1)} ms (goal p99 ≤ 30 ms)`
);
console.log(`  raw INSERT/s:   ${rawRate.toFixed(0)} (postgres.js, ${CLIENTS} concurrent)`);
console.log(
	`  ratio:          ${((appRate / rawRate) * 100).toFixed(1)} % of the raw rate (goal ≥ 50 %)`
);
await sql.end();
stop();
process.exit(0);
