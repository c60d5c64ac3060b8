/**
 * Floor benchmark: seeds one shop with N log entries (default 100,000; 200 entries a job, 20
 * steps, two jobs a day, 40 jobs open), plus a second shop of the same size, into a scratch
 * database with set-based SQL, then times what the foreman and the technician look at, with the
 * same SQL the app runs (src/lib/server/*-sql.ts). It prints p50 and p95 per query and the goal;
 * nothing here is asserted.
 *
 *   npm run bench:floor -- --entries 1000000 [--runs 40] [--keep] [--unchained]
 *
 * The log is seeded with the state-keeping trigger off, then the state is rebuilt from the log
 * by rebuild_log_state() (the same function `npm run db:rebuild-state` runs); its time is
 * printed too. --keep leaves the scratch database for a look afterwards.
 *
 * The hash chain's trigger (drizzle/0010) is the seed's main cost: about 7,000 entries a second
 * here, so 2 × 10M entries would take 48 minutes. --unchained seeds with it off: each entry gets
 * its seq from the shop's sequence, its position in the job, and two 64-character hex strings
 * where the chain's hashes go, so rows are as wide as chained ones, but they chain nothing. No
 * query measured here reads the chain; `npm run db:verify` on such a scratch log would fail.
 */
import { drizzle } from 'drizzle-orm/postgres-js';
import { sql, type SQL } from 'drizzle-orm';
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import os from 'node:os';
import postgres from 'postgres';
import { driftWindow, MAX_POINTS, POINT_BUCKETS } from '../src/lib/floor/drift-window';
import {
	driftPointsSql,
	driftStatsSql,
	stepReadingsSql,
	toolReadingsSql
} from '../src/lib/server/drift-sql';
import { jobLogPageSql } from '../src/lib/server/log/read-sql';
import { logPageSql, openOutOfSpecCountSql, openOutOfSpecSql } from '../src/lib/server/floor-sql';
import { jobSearchCountSql, jobSearchPageSql, listJobsSql } from '../src/lib/server/jobs-sql';
import { jobTableQuerySchema } from '../src/lib/schemas/job';
import { databaseUrl } from './lib/config.js';
import { applyMigrations } from './lib/migrate.js';
import { ensureDatabase, startCluster } from './lib/pg.js';

const { values: args } = parseArgs({
	options: {
		entries: { type: 'string', default: '100000' },
		runs: { type: 'string', default: '40' },
		keep: { type: 'boolean', default: false },
		unchained: { type: 'boolean', default: false }
	}
});
const ENTRIES = Number(args.entries);
const RUNS = Number(args.runs);
if (!Number.isInteger(ENTRIES) || ENTRIES < 10_000 || ENTRIES > 20_000_000) {
	console.error('--entries must be a whole number from 10,000 to 20,000,000.');
	process.exit(2);
}
const PER_JOB = 200;
const STEPS = 20;
const JOBS = Math.floor(ENTRIES / PER_JOB);
const OPEN_JOBS = 40;
const TOOLS = 4;
const CHUNK_JOBS = 2_500; // 500,000 entries a statement

const dbName = `benchcall_bench_floor_${ENTRIES}`;
const bin = await startCluster();
ensureDatabase(bin, dbName, { fresh: true });
const url = databaseUrl(dbName);
await applyMigrations(url);
const client = postgres(url, { max: 2, onnotice: () => {} });
const db = drizzle(client);
/**
 * --unchained: what the chain's trigger would set, for rows of alias `m` read in their order
 * (the shop's next seq each, so seq follows the time order as it does in the chained seed).
 */
const unchained = (m: string) => client`
	, ${client(m)}.chain_pos, nextval(log_seq_name(${client(m)}.shop_id)::regclass),
	md5(${client(m)}.id::text || 'p') || md5(${client(m)}.job_id::text),
	md5(${client(m)}.id::text) || md5(${client(m)}.job_id::text || 'e')`;
const secs = (t: number) => ((performance.now() - t) / 1000).toFixed(1);

try {
	console.log(
		`bench:floor — ${ENTRIES.toLocaleString('en')} entries a shop, two shops; ${os.cpus().length} cores, load average ${os
			.loadavg()
			.map((x) => x.toFixed(1))
			.join(' ')}`
	);
	const t0 = performance.now();
	await client`alter table log_entry disable trigger log_entry_keep_state`;
	if (args.unchained) await client`alter table log_entry disable trigger log_entry_zz_chain`;
	// The scratch history is written as it stood before its paid jobs closed (drizzle/0013).
	await client`alter table log_entry disable trigger log_entry_job_open`;
	const shops: { id: string; procId: string; tech: string; tools: string[] }[] = [];
	for (const name of ['Bench shop (scratch)', 'Other shop (scratch)']) {
		const [shop] = await client`insert into shop (name, bays)
			values (${name}, '{Bay 1,Bay 2,Bay 3,Bay 4,Bay 5,Bay 6}') returning id`;
		const techs = await client`
			insert into "user" (shop_id, email, name, role, password_hash)
			select ${shop.id}, 'tech' || g || '-' || ${shop.id} || '@bench.test', 'Technician ' || g,
				'technician', 'x'
			from generate_series(1, 8) g returning id`;
		const [proc] = await client`
			insert into procedure (shop_id, name) values (${shop.id}, 'Bench procedure') returning id`;
		await client`
			insert into procedure_step (shop_id, procedure_id, position, label, unit, nominal, min, max)
			select ${shop.id}, ${proc.id}, g, 'Bench step ' || g, 'N.m', 20 + g * 4, 18 + g * 4, 22 + g * 4
			from generate_series(1, ${STEPS}) g`;
		const tools = await client`
			insert into torque_tool (shop_id, identifier, kind, range_min, range_max, unit)
			select ${shop.id}, 'TW-' || g, 'click', 10, 120, 'N.m' from generate_series(1, ${TOOLS}) g
			returning id`;
		// Invented customers and vehicles, one for every two jobs.
		await client`
			insert into customer (shop_id, name)
			select ${shop.id}, 'Demo rider ' || g from generate_series(1, ${Math.ceil(JOBS / 2)}) g`;
		await client`
			insert into vehicle (shop_id, customer_id, registration, make, model)
			select c.shop_id, c.id, 'BC ' || lpad(split_part(c.name, ' ', 3), 6, '0'), 'Demo make', 'Demo model'
			from customer c where c.shop_id = ${shop.id}`;
		// Two jobs a day up to now; the newest OPEN_JOBS are in work, the rest paid.
		await client`
			insert into job (shop_id, number, technician_id, bay, state, created_at, customer_id, vehicle_id)
			select ${shop.id}, g, ${techs[0].id}, 'Bay ' || (g % 6 + 1),
				(case when g > ${JOBS - OPEN_JOBS} then 'in_work' else 'paid' end)::job_state,
				now() - make_interval(hours => (${JOBS} - g) * 12 + 4), v.customer_id, v.id
			from generate_series(1, ${JOBS}) g
			join vehicle v on v.shop_id = ${shop.id}
				and v.registration = 'BC ' || lpad(((g + 1) / 2)::text, 6, '0')`;
		await client`
			insert into job_procedure (shop_id, job_id, procedure_id, name, position)
			select ${shop.id}, j.id, ${proc.id}, 'Bench procedure', 1 from job j where j.shop_id = ${shop.id}`;
		await client`
			insert into job_step (shop_id, job_id, job_procedure_id, procedure_step_id, position, label,
				unit, nominal, min, max)
			select ${shop.id}, jp.job_id, jp.id, ps.id, ps.position, ps.label, ps.unit, ps.nominal, ps.min, ps.max
			from job_procedure jp cross join procedure_step ps
			where jp.shop_id = ${shop.id} and ps.procedure_id = ${proc.id}`;
		shops.push({
			id: shop.id,
			procId: proc.id,
			tech: techs[0].id,
			tools: tools.map((t) => t.id as string)
		});
	}
	console.log(`  jobs, steps, customers: ${secs(t0)} s`);
	// PER_JOB entries a job: 10 measurements of each step, 5 minutes apart; the first ten steps
	// with a torque tool. Both shops chunk by chunk, so their seqs interleave as they would.
	// The first job of each shop alone, then ANALYZE: the chain trigger's look-up of a repeated
	// id plans once for a whole statement, and on a never-analyzed table it may pick an index
	// led by shop_id alone and scan the shop's entries for each row (a live database has
	// statistics from autovacuum). Then CHUNK_JOBS jobs a statement.
	const t1 = performance.now();
	const starts = [1, 2];
	for (let lo = 2 + CHUNK_JOBS; lo <= JOBS; lo += CHUNK_JOBS) starts.push(lo);
	for (const [k, lo] of starts.entries()) {
		const hi = Math.min((starts[k + 1] ?? JOBS + 1) - 1, JOBS);
		if (k === 1) await client`analyze log_entry`;
		for (const shop of shops) {
			const measures = client`
				select gen_random_uuid() as id, st.shop_id, st.job_id, st.id as job_step_id,
					${shop.tech}::uuid as author_id, 'measure'::entry_kind as kind,
					'bench step ' || st.position || ' ' || v.x || ' nm' as raw_text,
					'typed'::entry_source as source, v.x as value, 'N.m' as unit, v.x as spec_value,
					'N.m' as spec_unit,
					(case when v.x < st.min then 'low' when v.x > st.max then 'high' else 'in' end)::verdict
						as verdict,
					case when st.position <= 10 then (${shop.tools}::uuid[])[(st.position + r) % ${TOOLS} + 1] end
						as torque_tool_id,
					j.created_at + make_interval(mins => r * 5 + st.position / 4) as occurred_at,
					((r - 1) * ${STEPS} + st.position)::int as chain_pos
				from job j
				join job_step st on st.job_id = j.id
				cross join generate_series(1, ${PER_JOB / STEPS}) r
				cross join lateral (select round((st.nominal + (random() - 0.45) * 5 + 0 * r)::numeric, 1)::float8 as x) v
				where j.shop_id = ${shop.id} and j.number between ${lo} and ${hi}
				order by occurred_at`;
			await client`
				insert into log_entry (id, shop_id, job_id, job_step_id, author_id, kind, raw_text, source,
					value, unit, spec_value, spec_unit, verdict, torque_tool_id, occurred_at
					${args.unchained ? client`, chain_pos, seq, prev_hash, entry_hash` : client``})
				select m.id, m.shop_id, m.job_id, m.job_step_id, m.author_id, m.kind, m.raw_text, m.source,
					m.value, m.unit, m.spec_value, m.spec_unit, m.verdict, m.torque_tool_id, m.occurred_at
					${args.unchained ? unchained('m') : client``}
				from (${measures}) m`;
		}
		process.stdout.write(`\r  log entries: ${hi * PER_JOB * 2} in ${secs(t1)} s`);
	}
	// One entry in 200 retracted (a typo undone), so reads must skip retracted entries.
	for (const shop of shops) {
		await client`
			insert into log_entry (id, shop_id, job_id, job_step_id, author_id, kind, raw_text, source,
				retracts, occurred_at
				${args.unchained ? client`, chain_pos, seq, prev_hash, entry_hash` : client``})
			select m.id, m.shop_id, m.job_id, m.job_step_id, m.author_id, m.kind, m.raw_text, m.source,
				m.retracts, m.occurred_at ${args.unchained ? unchained('m') : client``}
			from (
				select gen_random_uuid() as id, e.shop_id, e.job_id, e.job_step_id, e.author_id,
					'retraction'::entry_kind as kind, 'undo' as raw_text, 'typed'::entry_source as source,
					e.id as retracts, e.occurred_at + interval '1 minute' as occurred_at,
					(${PER_JOB} + row_number() over (partition by e.job_id order by e.seq))::int as chain_pos
				from log_entry e where e.shop_id = ${shop.id} and e.seq % 200 = 7
				order by e.seq) m`;
	}
	console.log(`\n  log seeded in ${secs(t1)} s`);
	await client`alter table log_entry enable trigger log_entry_keep_state`;
	await client`alter table log_entry enable trigger log_entry_zz_chain`;
	await client`alter table log_entry enable trigger log_entry_job_open`;
	const t2 = performance.now();
	await client`analyze`; // the rebuild's plans need the new rows' statistics
	for (const shop of shops) await client`select rebuild_log_state(${shop.id})`;
	console.log(`  derived state rebuilt from the log (both shops): ${secs(t2)} s`);
	await client`vacuum analyze`;
	const [{ n }] =
		await client`select count(*)::int as n from log_entry where shop_id = ${shops[0].id}`;
	const [{ size }] =
		await client`select pg_size_pretty(pg_database_size(current_database())) as size`;
	console.log(
		`Seeded ${n.toLocaleString('en')} entries over ${JOBS.toLocaleString('en')} jobs (and as many in a second shop) in ${secs(t0)} s; database ${size}.`
	);

	const shop = shops[0].id;
	const [step] = await client`
		select id, unit from procedure_step where procedure_id = ${shops[0].procId} and position = 7`;
	const [tool] = await client`
		select id from torque_tool where shop_id = ${shop} and identifier = 'TW-2'`;
	const [openJob] = await client`
		select id from job where shop_id = ${shop} and state = 'in_work' order by number limit 1`;
	const [mid] = await client`
		select seq from log_entry where shop_id = ${shop} order by seq offset ${Math.floor(n / 2)} limit 1`;
	const now = new Date();
	const window = driftWindow({}, now);
	if (!window.ok) throw new Error(window.message);
	const wide = driftWindow({ from: isoDay(now, -700), to: isoDay(now, 0) }, now);
	if (!wide.ok) throw new Error(wide.message);

	// Pages of data each query touches (shared buffers hit or read, from EXPLAIN ANALYZE): a figure
	// of the work done that the machine's load does not blur, for comparing 100k with 1M and 10M.
	let pages: number | null = null;
	async function exec(q: SQL) {
		if (pages !== null) {
			const [plan] = await db.execute(sql`explain (analyze, buffers, format json) ${q}`);
			const top = (plan['QUERY PLAN'] as { Plan: Record<string, number> }[])[0].Plan;
			pages += (top['Shared Hit Blocks'] ?? 0) + (top['Shared Read Blocks'] ?? 0);
		}
		return db.execute(q);
	}

	/** A drift view: statistics, then the points (downsampled beyond MAX_POINTS). */
	async function drift(readings: SQL) {
		const [stats] = await exec(driftStatsSql(readings));
		const count = Number(stats.n);
		const points = await exec(
			driftPointsSql(readings, {
				downsample: count > MAX_POINTS,
				buckets: POINT_BUCKETS,
				keepOut: Number(stats.n_out) <= MAX_POINTS - 2 * POINT_BUCKETS
			})
		);
		return `${count} readings, ${points.length} drawn`;
	}
	const search = jobTableQuerySchema.parse({ q: `rider ${Math.floor(JOBS / 3)}` });
	const list = jobTableQuerySchema.parse({});
	const cases: { name: string; goal: number; q: () => Promise<string | number> }[] = [
		{
			name: 'out-of-spec queue (page of 100 + count)',
			goal: 30,
			q: async () => {
				const [rows] = await Promise.all([
					exec(openOutOfSpecSql(shop, { limit: 101 })),
					exec(openOutOfSpecCountSql(shop))
				]);
				return rows.length;
			}
		},
		{
			name: 'bay board (active jobs with progress)',
			goal: 30,
			q: async () =>
				(
					await exec(
						listJobsSql(shop, { states: ['open', 'in_work', 'final_inspection', 'on_hold'] })
					)
				).length
		},
		{
			name: 'running log, first page (50)',
			goal: 30,
			q: async () => (await exec(logPageSql(shop, {}, undefined, 51))).length
		},
		{
			name: 'running log, older page (half-way back)',
			goal: 30,
			q: async () => (await exec(logPageSql(shop, {}, Number(mid.seq), 51))).length
		},
		{
			name: 'Bench: a job’s log, first page',
			goal: 30,
			q: async () => (await exec(jobLogPageSql(shop, openJob.id, { limit: 51 }))).length
		},
		{
			name: `jobs list, search "${search.q}"`,
			goal: 50,
			q: async () => {
				const [count] = await exec(jobSearchCountSql(shop, search));
				const ids = await exec(jobSearchPageSql(shop, search, 1));
				const rows = await exec(listJobsSql(shop, { ids: ids.map((r) => r.id as string) }));
				return `${rows.length} of ${count.n}`;
			}
		},
		{
			name: 'jobs list, first page (no search)',
			goal: 50,
			q: async () => {
				const [count] = await exec(jobSearchCountSql(shop, list));
				const ids = await exec(jobSearchPageSql(shop, list, 1));
				const rows = await exec(listJobsSql(shop, { ids: ids.map((r) => r.id as string) }));
				return `${rows.length} of ${count.n}`;
			}
		},
		{
			name: 'drift, one step, last 90 days',
			goal: 100,
			q: () => drift(stepReadingsSql(shop, step.id, step.unit, window))
		},
		{
			name: 'drift, one torque tool, last 90 days',
			goal: 100,
			q: () => drift(toolReadingsSql(shop, tool.id, window))
		},
		{
			name: 'drift, one step, widened to 700 days',
			goal: 100,
			q: () => drift(stepReadingsSql(shop, step.id, step.unit, wide))
		}
	];
	console.log(`\n${RUNS} runs each (after one warm-up), server side from this client:`);
	for (const c of cases) {
		await c.q(); // warm the cache and the plan
		const times: number[] = [];
		let rows: string | number = 0;
		for (let i = 0; i < RUNS; i++) {
			const t = performance.now();
			rows = await c.q();
			times.push(performance.now() - t);
		}
		pages = 0;
		await c.q();
		const touched = pages;
		pages = null;
		times.sort((a, b) => a - b);
		const p50 = times[Math.floor(RUNS / 2)];
		const p95 = times[Math.min(RUNS - 1, Math.ceil(RUNS * 0.95) - 1)];
		console.log(
			`${c.name.padEnd(44)} ${String(rows).padStart(24)}  p50 ${p50.toFixed(1).padStart(6)} ms  p95 ${p95.toFixed(1).padStart(6)} ms  goal p95 ≤ ${c.goal} ms${p95 <= c.goal ? '' : ' (missed)'}  ${touched.toLocaleString('en').padStart(7)} pages`
		);
	}
	console.log(
		`load average after: ${os
			.loadavg()
			.map((x) => x.toFixed(1))
			.join(' ')}`
	);
} finally {
	await client.end();
	if (!args.keep) {
		const { psqlAdmin } = await import('./lib/pg.js');
		psqlAdmin(bin, `DROP DATABASE IF EXISTS "${dbName}" WITH (FORCE)`);
	}
}

function isoDay(d: Date, days: number) {
	return new Date(d.getTime() + days * 86_400_000).toISOString().slice(0, 10);
}
