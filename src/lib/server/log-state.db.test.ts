// The state kept at each append (drizzle/0011: job_step_state, job_log_state; drizzle/0017:
// drift_reading) against the log it is derived from: after a random history of appends, single
// and batched, with retractions, accepts, redos and job steps edited on the way, the live state
// equals a rebuild from the log, and the queue, job progress and drift readings read from it
// equal what the full-scan queries read from the log itself (the SQL the Floor, the Jobs list
// and drift ran before the state existed, kept here as the reference).
import { sql, type SQL } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from './db';
import { addTorqueTool, logMeasurement, makeShop } from './db/fixtures';
import * as s from './db/schema';
import { stepReadingsSql, toolReadingsSql, type Window } from './drift-sql';
import { listOutOfSpec } from './floor/queue';
import { listJobs } from './jobs';

type Kind = 'measure' | 'done' | 'part' | 'note' | 'redo' | 'accept' | 'retraction';

/** A small deterministic generator, so a failure can be replayed. */
function random(seed: number) {
	let x = seed >>> 0;
	return () => {
		x = (Math.imul(x, 1664525) + 1013904223) >>> 0;
		return x / 2 ** 32;
	};
}

async function stateRows(shopId: string) {
	const steps = await db.execute(sql`
		select job_step_id, job_id, done, latest_measure_id, latest_measure_seq, latest_verdict, waiting
		from job_step_state where shop_id = ${shopId} and (done or latest_measure_id is not null)
		order by job_step_id`);
	const jobs = await db.execute(sql`
		select job_id, last_entry_at from job_log_state where shop_id = ${shopId}
		  and last_entry_at is not null order by job_id`);
	const readings = await db.execute(sql`
		select job_step_id, entry_id, job_id, procedure_step_id, torque_tool_id, occurred_at, value,
			unit, step_unit, nominal, label, verdict, job_number
		from drift_reading where shop_id = ${shopId} order by entry_id`);
	return {
		steps: steps.map((r) => ({ ...r })),
		jobs: jobs.map((r) => ({ ...r })),
		readings: readings.map((r) => ({ ...r }))
	};
}

/**
 * Readings as read from the log (drift's queries before drizzle/0017): `which` picks a torque
 * tool's or a library step's, with the unit rule of each.
 */
async function readingsFromLog(shopId: string, which: SQL, w: Window) {
	const rows = await db.execute(sql`
		select e.id, e.spec_value as value, e.verdict, j.number as job_number, st.label,
			coalesce(st.nominal, (st.min + st.max) / 2) as nominal
		from log_entry e
		join job j on j.id = e.job_id and j.shop_id = e.shop_id
		join job_step st on st.id = e.job_step_id and st.shop_id = e.shop_id
		where ${which} and e.shop_id = ${shopId}
		  and e.kind = 'measure' and e.spec_value is not null
		  and e.occurred_at >= ${w.from.toISOString()} and e.occurred_at < ${w.to.toISOString()}
		  and not exists (select 1 from log_entry r where r.retracts = e.id)
		order by e.id`);
	return rows.map((r) => ({ ...r }));
}

/** The same columns of drift's own query, in the same order. */
async function readingsOf(q: ReturnType<typeof toolReadingsSql>) {
	const rows = await db.execute(sql`
		with r as (${q}) select id, value, verdict, job_number, label, nominal from r order by id`);
	return rows.map((r) => ({ ...r }));
}

/** The queue as read from the whole log (the Floor's query before drizzle/0011). */
async function queueFromLog(shopId: string) {
	const rows = await db.execute(sql`
		with latest as (
			select distinct on (e.job_step_id) e.*
			from log_entry e
			where e.shop_id = ${shopId} and e.kind = 'measure' and e.job_step_id is not null
			  and not exists (select 1 from log_entry r where r.retracts = e.id)
			order by e.job_step_id, e.seq desc
		)
		select e.id from latest e join job j on j.id = e.job_id
		where e.verdict in ('low', 'high')
		  and j.state in ('open', 'in_work', 'final_inspection', 'on_hold', 'ready_to_invoice')
		  and not exists (
			select 1 from log_entry a
			where a.responds_to = e.id and a.kind in ('accept', 'redo')
			  and not exists (select 1 from log_entry r where r.retracts = a.id))
		order by e.seq asc`);
	return rows.map((r) => r.id as string);
}

/** Job progress as read from the whole log (the Jobs list's query before drizzle/0011). */
async function progressFromLog(shopId: string) {
	const rows = await db.execute(sql`
		with live as (
			select e.* from log_entry e
			where e.shop_id = ${shopId} and e.kind <> 'retraction'
			  and not exists (select 1 from log_entry r where r.retracts = e.id)
		),
		latest as (
			select distinct on (job_step_id) job_step_id, verdict
			from live where kind = 'measure' and job_step_id is not null
			order by job_step_id, seq desc
		)
		select j.id,
			(select count(distinct l.job_step_id) from live l where l.job_id = j.id
				and l.kind in ('measure', 'done', 'part')
				and not exists (select 1 from live d where d.job_step_id = l.job_step_id
					and d.kind = 'redo' and d.seq > l.seq))::int as steps_done,
			(select count(*) from job_step st join latest on latest.job_step_id = st.id
				where st.job_id = j.id and latest.verdict in ('low', 'high'))::int as out_of_spec,
			(select max(l.occurred_at) from live l where l.job_id = j.id) as last_entry_at
		from job j where j.shop_id = ${shopId} order by j.number desc`);
	return rows.map((r) => ({
		id: r.id as string,
		stepsDone: Number(r.steps_done),
		outOfSpec: Number(r.out_of_spec),
		lastEntryAt: r.last_entry_at ? new Date(r.last_entry_at as string).toISOString() : null
	}));
}

describe('state kept at append', () => {
	it('equals a rebuild from the log and what the log itself says, after a random history', async () => {
		const f = await makeShop('State');
		// A second job with its own steps, and two more steps on the first.
		const [job2] = await db
			.insert(s.job)
			.values({ shopId: f.shop.id, number: 2, technicianId: f.tech.id, state: 'in_work' })
			.returning();
		const [jp2] = await db
			.insert(s.jobProcedure)
			.values({ shopId: f.shop.id, jobId: job2.id, name: 'P', position: 1 })
			.returning();
		const more = await db
			.insert(s.jobStep)
			.values([
				{
					shopId: f.shop.id,
					jobId: f.job.id,
					jobProcedureId: f.step.jobProcedureId,
					position: 2,
					label: 'Front axle',
					unit: 'N.m',
					min: 50,
					max: 60
				},
				{
					shopId: f.shop.id,
					jobId: f.job.id,
					jobProcedureId: f.step.jobProcedureId,
					position: 3,
					label: 'Drain plug',
					unit: 'N.m',
					min: 20,
					max: 24
				},
				{
					shopId: f.shop.id,
					jobId: job2.id,
					jobProcedureId: jp2.id,
					position: 1,
					label: 'Chain slack',
					unit: 'mm',
					min: 25,
					max: 35
				},
				{
					shopId: f.shop.id,
					jobId: job2.id,
					jobProcedureId: jp2.id,
					position: 2,
					label: 'Spark plug',
					unit: 'N.m',
					min: 11,
					max: 13
				}
			])
			.returning();
		const steps = [f.step, ...more];
		const tools = [await addTorqueTool(f), await addTorqueTool(f, { identifier: 'TW-2 (demo)' })];
		// Two job steps done from one library step, so drift for a step spans jobs.
		const [proc] = await db
			.insert(s.procedure)
			.values({ shopId: f.shop.id, name: 'Library' })
			.returning();
		const [libStep] = await db
			.insert(s.procedureStep)
			.values({
				shopId: f.shop.id,
				procedureId: proc.id,
				position: 1,
				label: 'Axle',
				unit: 'N.m',
				min: 50,
				max: 60
			})
			.returning();
		for (const st of [more[0], more[3]]) {
			await db
				.update(s.jobStep)
				.set({ procedureStepId: libStep.id })
				.where(sql`${s.jobStep.id} = ${st.id}`);
		}
		const rnd = random(20261204);
		const pick = <T>(xs: T[]) => xs[Math.floor(rnd() * xs.length)];
		const written: { id: string; kind: Kind; stepId: string | null; jobId: string }[] = [];
		const t0 = Date.UTC(2026, 10, 1);

		function entry(i: number): typeof s.logEntry.$inferInsert {
			const kind = pick<Kind>([
				'measure',
				'measure',
				'measure',
				'measure',
				'done',
				'part',
				'note',
				'redo',
				'accept',
				'retraction',
				'retraction'
			]);
			const st = pick(steps);
			const base = {
				id: crypto.randomUUID(),
				shopId: f.shop.id,
				jobId: st.jobId,
				jobStepId: st.id as string | null,
				authorId: f.tech.id,
				kind,
				rawText: `entry ${i}`,
				source: 'typed' as const,
				// out of order in time now and then, as back-dated entries are
				occurredAt: new Date(t0 + i * 60_000 - (rnd() < 0.2 ? 3_600_000 : 0))
			};
			if (kind === 'measure') {
				const v = 30 * rnd();
				const verdict = pick(['in', 'low', 'high'] as const);
				const torqueToolId = rnd() < 0.7 ? pick(tools).id : null;
				return {
					...base,
					value: v,
					unit: 'N.m',
					specValue: v,
					specUnit: 'N.m',
					verdict,
					torqueToolId
				};
			}
			if (kind === 'note') return { ...base, jobStepId: rnd() < 0.5 ? null : st.id };
			if (kind === 'redo' || kind === 'accept') {
				const target = written.filter((w) => w.kind === 'measure' && w.stepId === st.id).pop();
				return target
					? { ...base, respondsTo: target.id, note: 'answer' }
					: { ...base, kind: 'note' };
			}
			if (kind === 'retraction') {
				// mostly an undo of something just logged, now and then of an older entry
				const open = written.filter((w) => w.kind !== 'retraction');
				const target = pick(rnd() < 0.7 ? open.slice(-3) : open);
				return target
					? { ...base, jobId: target.jobId, jobStepId: target.stepId, retracts: target.id }
					: { ...base, kind: 'note' };
			}
			return base;
		}

		let edited = false;
		for (let i = 0; i < 240;) {
			if (i >= 120 && !edited) {
				// Half-way: a spec and a label corrected, a step's unit changed (its readings so
				// far no longer count for its tool) and one step taken off the library step.
				edited = true;
				await db
					.update(s.jobStep)
					.set({ min: 52, max: 58, label: 'Front axle nut' })
					.where(sql`${s.jobStep.id} = ${more[0].id}`);
				await db
					.update(s.jobStep)
					.set({ unit: 'mm' })
					.where(sql`${s.jobStep.id} = ${more[1].id}`);
				await db
					.update(s.jobStep)
					.set({ procedureStepId: null, nominal: 12 })
					.where(sql`${s.jobStep.id} = ${more[3].id}`);
			}
			// Mostly single appends; now and then a batch in one statement, as group commit writes.
			const n = rnd() < 0.25 ? 2 + Math.floor(rnd() * 6) : 1;
			const batch: (typeof s.logEntry.$inferInsert)[] = [];
			for (let k = 0; k < n; k++, i++) {
				const e = entry(i);
				batch.push(e);
				written.push({
					id: e.id,
					kind: e.kind as Kind,
					stepId: e.jobStepId ?? null,
					jobId: e.jobId
				});
			}
			await db.insert(s.logEntry).values(batch);
			// after every append, the queue read from the state is the queue read from the log
			expect((await listOutOfSpec(f.shop.id)).map((q) => q.entryId)).toEqual(
				await queueFromLog(f.shop.id)
			);
		}

		const live = await stateRows(f.shop.id);
		expect(live.steps.length).toBeGreaterThan(0);
		// the history reached the interesting cases
		expect(live.steps.some((r) => r.waiting)).toBe(true);
		expect(live.steps.some((r) => r.latest_verdict === 'in')).toBe(true);

		expect((await listOutOfSpec(f.shop.id)).map((q) => q.entryId)).toEqual(
			await queueFromLog(f.shop.id)
		);
		const jobs = await listJobs(f.shop.id);
		expect(
			jobs.map((j) => ({
				id: j.id,
				stepsDone: j.stepsDone,
				outOfSpec: j.outOfSpec,
				lastEntryAt: j.lastEntryAt ? j.lastEntryAt.toISOString() : null
			}))
		).toEqual(await progressFromLog(f.shop.id));

		// drift, for each tool and the library step, read from drift_reading and from the log
		const w = { from: new Date(t0 - 86_400_000), to: new Date(t0 + 86_400_000) };
		expect(live.readings.length).toBeGreaterThan(50);
		for (const tool of tools) {
			const fromState = await readingsOf(toolReadingsSql(f.shop.id, tool.id, w));
			expect(fromState.length).toBeGreaterThan(5);
			expect(fromState).toEqual(
				await readingsFromLog(
					f.shop.id,
					sql`e.torque_tool_id = ${tool.id} and e.spec_unit = st.unit`,
					w
				)
			);
		}
		const fromState = await readingsOf(stepReadingsSql(f.shop.id, libStep.id, 'N.m', w));
		expect(fromState.length).toBeGreaterThan(5);
		expect(fromState).toEqual(
			await readingsFromLog(
				f.shop.id,
				sql`st.procedure_step_id = ${libStep.id} and e.spec_unit = 'N.m'`,
				w
			)
		);

		await db.execute(sql`select rebuild_log_state(${f.shop.id})`);
		expect(await stateRows(f.shop.id)).toEqual(live);
	});

	it('a rebuild touches only the shop it is given', async () => {
		const a = await makeShop('Rebuild A');
		const b = await makeShop('Rebuild B');
		for (const f of [a, b]) await logMeasurement(f, 70, 'low');
		const before = await stateRows(b.shop.id);
		expect(before.steps).toHaveLength(1);
		await db.execute(sql`select rebuild_log_state(${a.shop.id})`);
		expect(await stateRows(b.shop.id)).toEqual(before);
		expect((await stateRows(a.shop.id)).steps).toHaveLength(1);
	});
});
