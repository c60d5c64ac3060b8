/**
 * Load benchmark: 50 technicians each posting an entry every 2 s (open loop:
 * on schedule, whether or not the last one was answered) and 5 foremen on the Floor's live
 * stream, against the built app and the local PostgreSQL. Prints entries/s, p50/p99 append
 * latency, the stream's delivery delay (from a technician sending an entry to each foreman
 * receiving it), errors, and the app process's memory. Goals are printed beside the figures,
 * never asserted. Runs on its own database (benchcall_load, made anew each run).
 *
 *   npm run bench:load                   (2 minutes)
 *   npm run bench:load -- --seconds 30
 */
import { randomUUID } from 'node:crypto';
import { mkdirSync } from 'node:fs';
import { cpus } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import postgres from 'postgres';
import { ensureBuild } from './lib/build.js';
import { config } from './lib/config.js';
import {
	machineLoad,
	makeCrew,
	quantile,
	rssMb,
	signIn,
	sleep,
	startApp,
	stopApp
} from './lib/harness';
import { prepareDatabase } from './lib/prepare.js';

const { values: args } = parseArgs({
	options: {
		seconds: { type: 'string', default: '120' },
		technicians: { type: 'string', default: '50' },
		foremen: { type: 'string', default: '5' },
		'every-ms': { type: 'string', default: '2000' }
	}
});
const SECONDS = Number(args.seconds);
const TECHS = Number(args.technicians);
const FOREMEN = Number(args.foremen);
const EVERY_MS = Number(args['every-ms']);
for (const [name, v] of Object.entries({ SECONDS, TECHS, FOREMEN, EVERY_MS })) {
	if (!Number.isFinite(v) || v <= 0) {
		console.error(`${name.toLowerCase()} must be a positive number`);
		process.exit(2);
	}
}
const port = Number(process.env.BENCH_PORT ?? config.testPort + 40);
const logDir = join(config.dataDir, 'bench');
mkdirSync(logDir, { recursive: true });

const url = await prepareDatabase('benchcall_load', { fresh: true });
await ensureBuild();
const crew = await makeCrew(url, {
	technicians: TECHS,
	foremen: FOREMEN,
	prefix: 'load',
	firstJob: 7001
});
const app = await startApp({ port, databaseUrl: url, logFile: join(logDir, 'load-app.log') });
const base = app.base;
const loadBefore = machineLoad();

// One after another: sign-in counts each attempt against the address before checking the
// password, so 55 at once from 127.0.0.1 pass the per-address limit and are refused.
const techCookies: string[] = [];
for (const t of crew.technicians) techCookies.push(await signIn(base, t.email));
const foremanCookies: string[] = [];
for (const f of crew.foremen) foremanCookies.push(await signIn(base, f.email));

// Phrases a technician on the periodic service calls out: most in spec, some out, some notes.
const phrases = [
	'rear axle 88 nm',
	'drain plug 24 nm',
	'oil 1.1 l',
	'filter cover 10 nm',
	'front tyre 200 kpa',
	'rear tyre 2.3 bar',
	'chain slack 30 mm',
	'battery 12.6 v',
	'rear axle 99 nm',
	'note left fork seal weeping'
];

// ——— the foremen: the live stream, read as a browser's EventSource would ———
const sentAt = new Map<string, number>();
const delays: number[] = [];
const receivedBy = Array.from({ length: FOREMEN }, () => new Set<string>());
let streamErrors = 0;
const streams = new AbortController();
async function follow(i: number) {
	const res = await fetch(`${base}/api/floor/stream`, {
		headers: { cookie: foremanCookies[i], accept: 'text/event-stream' },
		signal: streams.signal
	});
	if (!res.ok || !res.body) throw new Error(`stream ${i + 1}: ${res.status}`);
	const reader = res.body.pipeThrough(new TextDecoderStream()).getReader();
	let buffer = '';
	let ready: () => void = () => {};
	const isReady = new Promise<void>((r) => (ready = r));
	void (async () => {
		try {
			for (;;) {
				const { value, done } = await reader.read();
				if (done) break;
				buffer += value;
				let cut: number;
				while ((cut = buffer.indexOf('\n\n')) >= 0) {
					const block = buffer.slice(0, cut);
					buffer = buffer.slice(cut + 2);
					const event = /^event: (.*)$/m.exec(block)?.[1];
					const data = /^data: (.*)$/m.exec(block)?.[1];
					if (event === 'ready') ready();
					if (event !== 'entry' || !data) continue;
					const now = performance.now();
					const { id } = JSON.parse(data) as { id: string };
					if (receivedBy[i].has(id)) continue;
					receivedBy[i].add(id);
					const sent = sentAt.get(id);
					if (sent !== undefined) delays.push(now - sent);
				}
			}
		} catch (err) {
			if (!streams.signal.aborted) {
				streamErrors++;
				console.error(`stream ${i + 1} ended: ${(err as Error).message}`);
			}
		}
	})();
	await isReady;
}
await Promise.all(crew.foremen.map((_, i) => follow(i)));

// ——— the technicians: one entry every EVERY_MS each, on schedule ———
const latencies: number[] = [];
const errors = new Map<string, number>();
const stored = new Set<string>();
const inFlight = new Set<Promise<void>>();
const memory: number[] = [];
const rssStart = rssMb(app.pid);
const memTimer = setInterval(() => {
	const mb = rssMb(app.pid);
	if (mb !== null) memory.push(mb);
}, 1000);

console.log(
	`Load: ${TECHS} technicians × 1 entry / ${EVERY_MS / 1000} s, ${FOREMEN} foremen on the live stream, ${SECONDS} s, built app on ${base} (pid ${app.pid})`
);
const started = performance.now();
const endAt = started + SECONDS * 1000;
async function technician(i: number) {
	const t = crew.technicians[i];
	let next = started + Math.random() * EVERY_MS;
	while (next < endAt) {
		await sleep(Math.max(0, next - performance.now()));
		next += EVERY_MS;
		const id = randomUUID();
		const text = phrases[Math.floor(Math.random() * phrases.length)];
		const p = (async () => {
			const t0 = performance.now();
			sentAt.set(id, t0);
			try {
				const res = await fetch(`${base}/api/jobs/${t.jobId}/entries`, {
					method: 'POST',
					headers: {
						cookie: techCookies[i],
						'content-type': 'application/json',
						accept: 'application/json'
					},
					body: JSON.stringify({ id, text, source: 'typed' })
				});
				await res.arrayBuffer();
				latencies.push(performance.now() - t0);
				if (res.status === 201) stored.add(id);
				else errors.set(`HTTP ${res.status}`, (errors.get(`HTTP ${res.status}`) ?? 0) + 1);
			} catch (err) {
				const key = `network: ${(err as Error).message}`;
				errors.set(key, (errors.get(key) ?? 0) + 1);
			}
		})();
		inFlight.add(p);
		void p.finally(() => inFlight.delete(p));
	}
}
await Promise.all(crew.technicians.map((_, i) => technician(i)));
await Promise.all(inFlight);
const elapsed = (performance.now() - started) / 1000;
// Give the last entries a moment to reach the foremen before counting what they missed.
const settle = performance.now() + 5000;
while (performance.now() < settle && receivedBy.some((r) => [...stored].some((id) => !r.has(id))))
	await sleep(100);
clearInterval(memTimer);
streams.abort();
const loadAfter = machineLoad();

const sql = postgres(url, { max: 1, onnotice: () => {} });
const [{ n: inDb }] = await sql`select count(*)::int as n from log_entry
	where author_id in ${sql(crew.technicians.map((t) => t.id))}`;
await sql.end();
await stopApp(app);

latencies.sort((a, b) => a - b);
delays.sort((a, b) => a - b);
const missed = receivedBy.reduce((n, r) => n + [...stored].filter((id) => !r.has(id)).length, 0);
const errorCount = [...errors.values()].reduce((a, b) => a + b, 0) + streamErrors + missed;
const ms = (x: number) => `${x.toFixed(1)} ms`;
const row = (label: string, figure: string, goal = '') =>
	console.log(`  ${label.padEnd(26)} ${figure.padEnd(30)} ${goal}`);

console.log(`\nLoad benchmark, ${elapsed.toFixed(1)} s measured`);
console.log(
	`  machine: ${cpus().length} cores; ${loadBefore} before, ${loadAfter} after (shared machine)`
);
row('entries stored', `${stored.size} (in the database: ${inDb})`);
row(
	'entries/s',
	(stored.size / elapsed).toFixed(1),
	`(offered: ${((TECHS * 1000) / EVERY_MS).toFixed(1)}/s)`
);
row('append latency p50', ms(quantile(latencies, 0.5)));
row('append latency p99', ms(quantile(latencies, 0.99)), 'goal ≤ 50 ms');
row('append latency max', ms(latencies[latencies.length - 1] ?? Number.NaN));
row(
	'stream delay p50',
	ms(quantile(delays, 0.5)),
	`(${delays.length} deliveries to ${FOREMEN} foremen)`
);
row('stream delay p99', ms(quantile(delays, 0.99)), 'goal ≤ 500 ms');
row('errors', String(errorCount), 'goal 0');
for (const [kind, n] of errors) row(`  ${kind}`, String(n));
if (streamErrors) row('  streams ended early', String(streamErrors));
if (missed) row('  deliveries missed', String(missed));
row(
	'app memory (RSS)',
	`${rssStart?.toFixed(0) ?? '?'} MB at start, peak ${Math.max(...memory).toFixed(0)} MB, end ${memory.at(-1)?.toFixed(0) ?? '?'} MB`
);
process.exit(0);
