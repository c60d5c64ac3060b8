/**
 * Floor benchmark: seeds 100,000 log entries over 500 jobs into a scratch database and prints
 * the measured time of the running log's first page and of a drift query over one step, with
 * the same SQL the app runs (src/lib/server/floor-sql.ts). It prints figures only; nothing here
 * is asserted. Goals (issue 7): first log page ≤ 50 ms, drift query ≤ 200 ms.
 *
 *   npm run bench:floor
 */
import { drizzle } from 'drizzle-orm/postgres-js';
import { performance } from 'node:perf_hooks';
import postgres from 'postgres';
import { driftStepSql, logPageSql } from '../src/lib/server/floor-sql';
import { databaseUrl } from './lib/config.js';
import { applyMigrations } from './lib/migrate.js';
import { ensureDatabase, startCluster } from './lib/pg.js';

const dbName = 'benchcall_bench_floor';
const JOBS = 500;
const STEPS_PER_JOB = 20;
const ENTRIES = 100_000;
const RUNS = 30;

const bin = await startCluster();
ensureDatabase(bin, dbName, { fresh: true });
const url = databaseUrl(dbName);
await applyMigrations(url);
const client = postgres(url, { max: 2, onnotice: () => {} });
const db = drizzle(client);

try {
	const t0 = performance.now();
	const [shop] = await client`insert into shop (name, bays) values ('Bench shop (scratch)',
		'{Bay 1,Bay 2,Bay 3,Bay 4,Bay 5,Bay 6}') returning id`;
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
		from generate_series(1, ${STEPS_PER_JOB}) g`;
	// A second shop with the same volume, so every query has to filter by shop.
	const [other] =
		await client`insert into shop (name) values ('Other shop (scratch)') returning id`;
	for (const s of [shop.id, other.id]) {
		const author =
			s === shop.id
				? techs[0].id
				: (
						await client`insert into "user" (shop_id, email, name, role, password_hash)
				values (${s}, ${'o-' + s + '@bench.test'}, 'Other', 'technician', 'x') returning id`
					)[0].id;
		await client`
			insert into job (shop_id, number, technician_id, bay, state, created_at)
			select ${s}, g, ${author}, 'Bay ' || (g % 6 + 1),
				(case when g > ${JOBS - 40} then 'in_work' else 'paid' end)::job_state,
				now() - make_interval(days => ${JOBS} - g)
			from generate_series(1, ${JOBS}) g`;
		await client`
			insert into job_procedure (shop_id, job_id, procedure_id, name, position)
			select ${s}, j.id, ${proc.id}, 'Bench procedure', 1 from job j where j.shop_id = ${s}`;
		await client`
			insert into job_step (shop_id, job_id, job_procedure_id, procedure_step_id, position, label,
				unit, nominal, min, max)
			select ${s}, jp.job_id, jp.id, ps.id, ps.position, ps.label, ps.unit, ps.nominal, ps.min, ps.max
			from job_procedure jp cross join procedure_step ps
			where jp.shop_id = ${s} and ps.procedure_id = ${proc.id}`;
	}
	// ENTRIES / JOBS entries per job, spread over its steps and its day; both shops' entries in one
	// insert ordered by time, so their seqs interleave as they would when shops work side by side.
	await client`
		with steps as (
			select st.id, st.job_id, st.shop_id, st.nominal, j.created_at, j.technician_id,
				row_number() over (partition by st.job_id order by st.position) as k
			from job_step st join job j on j.id = st.job_id
		)
		insert into log_entry (id, shop_id, job_id, job_step_id, author_id, kind, raw_text, source,
			value, unit, spec_value, spec_unit, verdict, occurred_at)
		select gen_random_uuid(), st.shop_id, st.job_id, st.id, st.technician_id, 'measure',
			'bench step ' || st.k || ' ' || v.x || ' nm', 'typed', v.x, 'N.m', v.x, 'N.m',
			(case when v.x < st.nominal - 2 then 'low' when v.x > st.nominal + 2 then 'high'
				else 'in' end)::verdict,
			st.created_at + make_interval(mins => r * 5)
		from steps st
		cross join generate_series(1, ${ENTRIES / JOBS / STEPS_PER_JOB}) r
		cross join lateral (select round((st.nominal + (random() - 0.45) * 5)::numeric, 1)::float8 as x) v
		order by st.created_at + make_interval(mins => r * 5)`;
	await client`analyze`;
	const [{ n }] = await client`select count(*)::int as n from log_entry where shop_id = ${shop.id}`;
	console.log(
		`Seeded ${n.toLocaleString('en')} entries over ${JOBS} jobs (and as many in a second shop) in ${((performance.now() - t0) / 1000).toFixed(1)} s.`
	);

	const [step] = await client`
		select id, unit from procedure_step where procedure_id = ${proc.id} and position = 7`;
	const cases = [
		{
			name: 'running log, first page (50)',
			goal: 50,
			q: () => logPageSql(shop.id, {}, undefined, 51)
		},
		{
			name: 'running log, first page, verdict filter',
			goal: 50,
			q: () => logPageSql(shop.id, { verdict: 'out' }, undefined, 51)
		},
		{
			name: 'drift, one step across jobs',
			goal: 200,
			q: () => driftStepSql(shop.id, step.id, step.unit)
		}
	];
	for (const c of cases) {
		await db.execute(c.q()); // warm the cache and the plan
		const times: number[] = [];
		let rows = 0;
		for (let i = 0; i < RUNS; i++) {
			const t = performance.now();
			rows = (await db.execute(c.q())).length;
			times.push(performance.now() - t);
		}
		times.sort((a, b) => a - b);
		const p50 = times[Math.floor(RUNS / 2)];
		const p95 = times[Math.floor(RUNS * 0.95)];
		console.log(
			`${c.name.padEnd(42)} ${rows.toString().padStart(5)} rows  p50 ${p50.toFixed(1)} ms  p95 ${p95.toFixed(1)} ms  (goal ≤ ${c.goal} ms)`
		);
	}
} finally {
	await client.end();
}
