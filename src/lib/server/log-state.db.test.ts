// The state kept at each append (drizzle/0011: job_step_state, job_log_state) against the log it
// is derived from: after a random history of appends, single and batched, with retractions,
// accepts and redos, the live state equals a rebuild from the log, and the queue and job
// progress read from it equal what the full-scan queries read from the log itself (the SQL the
// Floor and the Jobs list ran before the state existed, kept here as the reference).
import { sql } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from './db';
import { logMeasurement, makeShop } from './db/fixtures';
import * as s from './db/schema';
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
	return { steps: steps.map((r) => ({ ...r })), jobs: jobs.map((r) => ({ ...r })) };
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
				return { ...base, value: v, unit: 'N.m', specValue: v, specUnit: 'N.m', verdict };
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

		for (let i = 0; i < 240;) {
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
