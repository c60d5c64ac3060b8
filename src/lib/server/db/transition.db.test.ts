import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { stateHistory, transitionJob } from '../jobs';
import { db } from './index';
import { logMeasurement, makeShop } from './fixtures';
import * as s from './schema';

describe('transitionJob', () => {
	it('records who, when and why, and resumes a held job where it left off', async () => {
		const f = await makeShop('Transitions');
		const held = await transitionJob(f.shop.id, f.job.id, 'on_hold', {
			byUserId: f.owner.id,
			reason: 'Waiting for a chain'
		});
		expect(held).toEqual({ ok: true, from: 'in_work', to: 'on_hold' });
		expect(
			await transitionJob(f.shop.id, f.job.id, 'open', { byUserId: f.owner.id })
		).toMatchObject({ ok: false });
		expect(
			await transitionJob(f.shop.id, f.job.id, 'in_work', { byUserId: f.owner.id })
		).toMatchObject({ ok: true, to: 'in_work' });
		const history = await stateHistory(f.shop.id, f.job.id);
		expect(history.map((h) => [h.fromState, h.toState, h.reason, h.byName])).toEqual([
			['on_hold', 'in_work', null, 'Owner'],
			['in_work', 'on_hold', 'Waiting for a chain', 'Owner']
		]);
	});

	it('reads the guards from the job: open steps, sign-off, unanswered out-of-spec entries', async () => {
		const f = await makeShop('Guards');
		const open = await transitionJob(f.shop.id, f.job.id, 'final_inspection', {
			byUserId: f.tech.id
		});
		expect(open).toMatchObject({
			ok: false,
			message: expect.stringContaining('1 step is not done')
		});
		await logMeasurement(f, 70, 'low');
		expect(
			await transitionJob(f.shop.id, f.job.id, 'final_inspection', { byUserId: f.tech.id })
		).toMatchObject({ ok: true });
		await db.update(s.job).set({ signedOffAt: new Date() }).where(eq(s.job.id, f.job.id));
		const blocked = await transitionJob(f.shop.id, f.job.id, 'ready_to_invoice', {
			byUserId: f.owner.id
		});
		expect(blocked).toMatchObject({ ok: false, message: expect.stringContaining('out-of-spec') });
		const [job] = await db.select().from(s.job).where(eq(s.job.id, f.job.id));
		expect(job.state).toBe('final_inspection');
	});

	it("refuses another shop's job and a stale expected state", async () => {
		const a = await makeShop('A');
		const b = await makeShop('B');
		expect(
			await transitionJob(b.shop.id, a.job.id, 'on_hold', { byUserId: b.owner.id, reason: 'x' })
		).toEqual({ ok: false, kind: 'not_found', message: 'No such job card in this shop.' });
		expect(
			await transitionJob(a.shop.id, a.job.id, 'final_inspection', {
				byUserId: a.owner.id,
				reason: 'x',
				expectedFrom: 'open'
			})
		).toMatchObject({ ok: false, kind: 'conflict' });
	});
});
