import { describe, expect, it } from 'vitest';
import { answerStatus } from './http';
import { db } from './db';
import { logMeasurement, makeShop } from './db/fixtures';
import * as s from './db/schema';
import { appendEntry } from './log/append';
import { stepHistory } from './step-history';

type Fixture = Awaited<ReturnType<typeof makeShop>>;

/** An earlier job on the same vehicle with the same step (label and unit), as a past service. */
async function earlierJob(f: Fixture, label: string, unit: string | null) {
	const [job] = await db
		.insert(s.job)
		.values({
			shopId: f.shop.id,
			number: 2,
			customerId: f.customer.id,
			vehicleId: f.vehicle.id,
			technicianId: f.tech.id,
			state: 'in_work',
			createdAt: new Date('2026-06-01T08:00:00Z')
		})
		.returning();
	const [jp] = await db
		.insert(s.jobProcedure)
		.values({ shopId: f.shop.id, jobId: job.id, procedureId: null, name: 'Earlier', position: 1 })
		.returning();
	const [step] = await db
		.insert(s.jobStep)
		.values({ shopId: f.shop.id, jobId: job.id, jobProcedureId: jp.id, position: 1, label, unit })
		.returning();
	return { ...f, job, step };
}

describe('stepHistory ("history <step>" on the Bench)', () => {
	it("lists the step's readings on this vehicle across its jobs, newest first, without retracted ones", async () => {
		const f = await makeShop('History');
		const past = await earlierJob(f, 'rear axle nut', 'N.m');
		await logMeasurement(past, 86, 'in');
		const tech = { id: f.tech.id, shopId: f.shop.id, role: 'technician' as const };
		const now = await appendEntry(tech, f.job.id, {
			id: crypto.randomUUID(),
			text: 'rear axle 70 nm',
			source: 'typed'
		});
		expect(answerStatus(now)).toBe(201);
		const wrong = await appendEntry(tech, f.job.id, {
			id: crypto.randomUUID(),
			text: 'rear axle 99 nm',
			source: 'typed'
		});
		expect(answerStatus(wrong)).toBe(201);
		await appendEntry(tech, f.job.id, { id: crypto.randomUUID(), text: 'undo', source: 'typed' });

		const view = await stepHistory(f.shop.id, f.job.id, f.step.id);
		expect(view).toMatchObject({
			stepLabel: 'Rear axle nut',
			unit: 'N.m',
			registration: f.vehicle.registration,
			total: 2
		});
		expect(view!.readings.map((r) => [r.value, r.verdict, r.jobNumber, r.thisJob])).toEqual([
			[70, 'low', 1, true],
			[86, 'in', 2, false]
		]);
		expect((await stepHistory(f.shop.id, f.job.id, f.step.id, 1))!.readings).toHaveLength(1);
	});

	it('keeps other vehicles, other units and other shops out', async () => {
		const f = await makeShop('History scope');
		const other = await makeShop('History other');
		await logMeasurement(other, 88, 'in');
		const torqueInOtherUnit = await earlierJob(f, 'Rear axle nut', 'kgf.m');
		await db.insert(s.logEntry).values({
			id: crypto.randomUUID(),
			shopId: f.shop.id,
			jobId: torqueInOtherUnit.job.id,
			jobStepId: torqueInOtherUnit.step.id,
			authorId: f.tech.id,
			kind: 'measure',
			rawText: 'rear axle 9 kgf m',
			source: 'typed',
			value: 9,
			unit: 'kgf.m',
			specValue: 9,
			specUnit: 'kgf.m',
			verdict: 'no_spec',
			occurredAt: new Date()
		});
		const view = await stepHistory(f.shop.id, f.job.id, f.step.id);
		expect(view).toMatchObject({ total: 0, readings: [] });
		// another shop's job or step reads as missing
		expect(await stepHistory(other.shop.id, f.job.id, f.step.id)).toBeNull();
		expect(await stepHistory(f.shop.id, f.job.id, other.step.id)).toBeNull();
		expect(await stepHistory(f.shop.id, f.job.id, 'not-a-uuid')).toBeNull();
	});
});
