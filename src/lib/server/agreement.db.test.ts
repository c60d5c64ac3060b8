// One definition of "step done" and "out of spec waiting for an answer": the Bench,
// the Jobs list, the job state machine and the Floor read the same state (job_step_state,
// drizzle/0011) and must agree after a redo, an accept, a retraction and a re-measure.
import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from './db';
import { makeShop } from './db/fixtures';
import * as s from './db/schema';
import type { Actor } from './bench/job';
import { listSteps } from './bench/steps';
import { appendEntry } from './log/append';
import { floorBoard } from './floor/board';
import { acceptEntry, listOutOfSpec, orderRedo } from './floor/queue';
import { listJobs, transitionFacts } from './jobs';

type Fixture = Awaited<ReturnType<typeof makeShop>>;

async function addStep(f: Fixture, position: number, label: string, min: number, max: number) {
	const [jp] = await db.select().from(s.jobProcedure).where(eq(s.jobProcedure.jobId, f.job.id));
	await db.insert(s.jobStep).values({
		shopId: f.shop.id,
		jobId: f.job.id,
		jobProcedureId: jp.id,
		position,
		label,
		unit: 'mm',
		min,
		max
	});
}

/** What each reader says about the job: steps done and out-of-spec entries waiting. */
async function readers(f: Fixture) {
	const bench = await listSteps(f.shop.id, f.job.id);
	const [jobsList] = await listJobs(f.shop.id, { ids: [f.job.id] });
	const machine = await transitionFacts(f.shop.id, f.job.id);
	const queue = await listOutOfSpec(f.shop.id, f.job.id);
	const board = (await floorBoard(f.shop.id)).board.find((j) => j.id === f.job.id)!;
	return {
		bench: { done: bench.filter((st) => st.done).length },
		jobsList: { done: jobsList.stepsDone, waiting: jobsList.waiting },
		machine: { done: machine.stepsDone, waiting: machine.openOutOfSpec },
		floor: { waiting: queue.length, board: board.openOutOfSpec }
	};
}

function expectAgreement(r: Awaited<ReturnType<typeof readers>>, done: number, waiting: number) {
	expect(r).toEqual({
		bench: { done },
		jobsList: { done, waiting },
		machine: { done, waiting },
		floor: { waiting, board: waiting }
	});
}

describe('the Bench, the Jobs list, the state machine and the Floor agree', () => {
	it('after a redo, an accept, a retraction and a re-measure', async () => {
		const f = await makeShop('Agreement');
		await addStep(f, 2, 'Chain slack', 25, 35);
		await addStep(f, 3, 'Brake pedal free play', 20, 30);
		const tech: Actor = { id: f.tech.id, shopId: f.shop.id, role: 'technician' };
		const foreman = { id: f.owner.id, shopId: f.shop.id, name: 'Owner' };
		const log = async (text: string) => {
			const r = await appendEntry(tech, f.job.id, {
				id: crypto.randomUUID(),
				text,
				source: 'typed'
			});
			if (!('entry' in r)) throw new Error(`${text}: ${JSON.stringify(r)}`);
			return r.entry;
		};
		expectAgreement(await readers(f), 0, 0);

		// an "under" value: done, waiting for the foreman
		const under = await log('rear axle 70 nm');
		expectAgreement(await readers(f), 1, 1);
		// the foreman orders a redo: the step is not done again, and nothing waits
		expect(await orderRedo(foreman, under.id, 'Torque it again to spec')).toMatchObject({
			ok: true
		});
		expectAgreement(await readers(f), 0, 0);
		// re-measured in spec: done, nothing waiting
		await log('rear axle 88 nm');
		expectAgreement(await readers(f), 1, 0);

		// an "over" value the foreman accepts with a reason: done, nothing waiting
		const over = await log('chain slack 38 mm');
		expectAgreement(await readers(f), 2, 1);
		const accepted = await acceptEntry(
			foreman,
			over.id,
			'Chain is new; slack settles within the first 500 km'
		);
		expect(accepted).toMatchObject({ ok: true });
		expectAgreement(await readers(f), 2, 0);

		// an in-spec value, then retracted: not done again
		await log('brake pedal free play 25 mm');
		expectAgreement(await readers(f), 3, 0);
		await log('undo');
		expectAgreement(await readers(f), 2, 0);

		// an out-of-spec value retracted: nothing waits for it any more
		await log('brake pedal free play 40 mm');
		expectAgreement(await readers(f), 3, 1);
		await log('undo');
		expectAgreement(await readers(f), 2, 0);
	});
});
