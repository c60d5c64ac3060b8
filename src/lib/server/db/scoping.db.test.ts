import { describe, expect, it } from 'vitest';
import { listJobs } from '../jobs';
import { listStaff, setActive, setRole } from '../staff';
import { logMeasurement, makeShop } from './fixtures';

describe('shop scoping', () => {
	it("never returns another shop's jobs", async () => {
		const a = await makeShop('Shop A');
		const b = await makeShop('Shop B');
		await logMeasurement(a, 99, 'high');
		const jobsB = await listJobs(b.shop.id);
		expect(jobsB.map((j) => j.id)).toEqual([b.job.id]);
		expect(jobsB[0].outOfSpec).toBe(0);
		const jobsA = await listJobs(a.shop.id);
		expect(jobsA.map((j) => j.id)).toEqual([a.job.id]);
		expect(jobsA[0].outOfSpec).toBe(1);
	});

	it("never lists another shop's staff", async () => {
		const a = await makeShop('Shop A');
		const b = await makeShop('Shop B');
		const staffB = await listStaff(b.shop.id);
		expect(staffB.map((u) => u.id).sort()).toEqual([b.owner.id, b.tech.id].sort());
		expect(staffB.some((u) => u.id === a.owner.id)).toBe(false);
	});

	it("cannot change another shop's account", async () => {
		const a = await makeShop('Shop A');
		const b = await makeShop('Shop B');
		expect(await setRole(b.shop.id, a.tech.id, 'owner')).toEqual({
			ok: false,
			kind: 'not_found',
			message: 'No such account in this shop.'
		});
		expect(await setActive(b.shop.id, a.tech.id, false)).toMatchObject({ ok: false });
		const staffA = await listStaff(a.shop.id);
		expect(staffA.find((u) => u.id === a.tech.id)).toMatchObject({
			role: 'technician',
			active: true
		});
	});

	it('keeps at least one active owner', async () => {
		const a = await makeShop('Shop A');
		expect(await setActive(a.shop.id, a.owner.id, false)).toMatchObject({ ok: false });
		expect(await setRole(a.shop.id, a.owner.id, 'technician')).toMatchObject({ ok: false });
	});
});

describe('job progress', () => {
	it('counts a step done once it has an entry and clears out-of-spec after an in-spec re-log', async () => {
		const a = await makeShop('Progress');
		await logMeasurement(a, 70, 'low');
		let [job] = await listJobs(a.shop.id);
		expect(job).toMatchObject({ stepsTotal: 1, stepsDone: 1, outOfSpec: 1 });
		await logMeasurement(a, 88, 'in');
		[job] = await listJobs(a.shop.id);
		expect(job.outOfSpec).toBe(0);
	});
});
