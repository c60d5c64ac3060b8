// Every change of a job's state goes through transitionJob (jobs.ts): the Bench's first entry
// on an open job (open → in work) and its hand-over (in work → final inspection) included.
// The spy wraps the real function, so the state machine still decides and records each change.
import { answerStatus } from '../http';
import { eq } from 'drizzle-orm';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { db } from '../db';
import { makeShop } from '../db/fixtures';
import * as s from '../db/schema';
import * as jobs from '../jobs';
import { sendToFinalInspection } from './hand-over';
import type { Actor } from './job';
import { appendEntry } from '../log/append';

vi.mock('../jobs', async (original) => {
	const real = await original<typeof import('../jobs')>();
	return { ...real, transitionJob: vi.fn(real.transitionJob) };
});

const as = (u: { id: string; shopId: string; role: Actor['role'] }): Actor => ({
	id: u.id,
	shopId: u.shopId,
	role: u.role
});

async function changes(jobId: string) {
	return db
		.select({ from: s.jobStateChange.fromState, to: s.jobStateChange.toState })
		.from(s.jobStateChange)
		.where(eq(s.jobStateChange.jobId, jobId));
}

afterEach(() => vi.mocked(jobs.transitionJob).mockClear());

describe('state changes from the Bench', () => {
	it('puts an open job in work through transitionJob at its first entry', async () => {
		const f = await makeShop('Open job');
		await db.update(s.job).set({ state: 'open' }).where(eq(s.job.id, f.job.id));
		const r = await appendEntry(as(f.tech), f.job.id, {
			id: crypto.randomUUID(),
			text: 'rear axle nut 80 Nm',
			source: 'typed'
		});
		expect(answerStatus(r)).toBe(201);
		expect(jobs.transitionJob).toHaveBeenCalledWith(
			f.shop.id,
			f.job.id,
			'in_work',
			expect.objectContaining({ byUserId: f.tech.id })
		);
		const [row] = await db.select().from(s.job).where(eq(s.job.id, f.job.id));
		expect(row.state).toBe('in_work');
		expect(await changes(f.job.id)).toEqual([{ from: 'open', to: 'in_work' }]);
	});

	it('hands over through transitionJob, which refuses a move the machine does not have', async () => {
		const f = await makeShop('Hand-over');
		const reason = 'Axle nut on back order';
		const ok = await sendToFinalInspection(as(f.tech), f.job.id, reason);
		expect(ok).toEqual({ ok: true, state: 'final_inspection' });
		expect(jobs.transitionJob).toHaveBeenCalledWith(
			f.shop.id,
			f.job.id,
			'final_inspection',
			expect.objectContaining({ byUserId: f.tech.id, reason })
		);
		// Already in final inspection: the machine's refusal, as a conflict.
		const again = await sendToFinalInspection(as(f.tech), f.job.id, reason);
		expect(again).toEqual({
			ok: false,
			kind: 'conflict',
			message: 'The job is already final inspection.'
		});
		expect(jobs.transitionJob).toHaveBeenCalledTimes(2);
		expect(await changes(f.job.id)).toEqual([{ from: 'in_work', to: 'final_inspection' }]);
	});
});
