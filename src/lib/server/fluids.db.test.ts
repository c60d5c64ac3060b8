import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from './db';
import { entryOf, makeShop } from './db/fixtures';
import * as s from './db/schema';
import { listSteps } from './bench/steps';
import { appendEntry } from './log/append';
import { listOutOfSpec } from './floor/queue';
import { workReport } from './work-report';

// Invented demo step; the spec is written the way manuals write one (common practice).
async function oilJob(name: string) {
	const f = await makeShop(name);
	const [jp] = await db.select().from(s.jobProcedure).where(eq(s.jobProcedure.jobId, f.job.id));
	const [oil] = await db
		.insert(s.jobStep)
		.values({
			shopId: f.shop.id,
			jobId: f.job.id,
			jobProcedureId: jp!.id,
			position: 2,
			label: 'Engine oil fill',
			unit: 'L',
			min: 1.0,
			max: 1.2,
			fluid: 'SAE 10W-30, API SJ or higher, JASO MA'
		})
		.returning();
	const tech = { id: f.tech.id, shopId: f.shop.id, role: 'technician' as const };
	const post = (text: string) =>
		appendEntry(tech, f.job.id, { id: crypto.randomUUID(), text, source: 'typed' });
	return { ...f, oil: oil!, post };
}

describe('fluid grades at the append', () => {
	it('keeps the grade and its verdict; a wrong grade waits on the Floor with reason grade', async () => {
		const f = await oilJob('Fluids');
		expect((await listSteps(f.shop.id, f.job.id)).find((st) => st.id === f.oil.id)?.fluid).toBe(
			'SAE 10W-30, API SJ or higher, JASO MA'
		);
		// JASO T 903: MB never meets an MA spec; the quantity is in spec all the same
		const wrong = entryOf(await f.post('oil 10W-40 JASO MB 1.1 L'));
		expect(wrong).toMatchObject({
			stepId: f.oil.id,
			verdict: 'in',
			fluid: 'SAE 10W-40 · JASO MB',
			fluidVerdict: 'fails'
		});
		const [row] = await db.select().from(s.logEntry).where(eq(s.logEntry.id, wrong.id));
		expect(row).toMatchObject({ fluid: 'SAE 10W-40 · JASO MB', fluidVerdict: 'fails' });
		const queue = await listOutOfSpec(f.shop.id, f.job.id);
		expect(queue).toHaveLength(1);
		expect(queue[0]).toMatchObject({ entryId: wrong.id, reason: 'grade', verdict: 'in' });

		// the right oil, grade stated (API 1509: SN is later than SJ), clears the step's item
		const right = entryOf(await f.post('oil 1.1 l 10w-30 api sn jaso ma2'));
		expect(right.fluidVerdict).toBe('meets');
		expect(await listOutOfSpec(f.shop.id, f.job.id)).toEqual([]);

		// the work report (and its PDF, which prints the same lines) shows the spec and each grade
		const report = await workReport(f.shop.id, f.job.id);
		const step = report.procedures
			.flatMap((p) => p.steps)
			.find((st) => st.label === 'Engine oil fill');
		expect(step?.spec).toContain('SAE 10W-30, API SJ or higher, JASO MA');
		expect(step?.entries.map((e) => e.value)).toEqual([
			'1.1 L · SAE 10W-40 · JASO MB (wrong grade)',
			'1.1 L · SAE 10W-30 · API SN · JASO MA2 (grade meets spec)'
		]);
	});

	it('logs a fill without a grade as grade not stated, and a quantity-only step as before', async () => {
		const f = await oilJob('Fluids quiet');
		const quiet = entryOf(await f.post('oil 1.1 L'));
		expect(quiet).toMatchObject({ fluid: null, fluidVerdict: 'not_stated', verdict: 'in' });
		const axle = entryOf(await f.post('rear axle 85 nm'));
		expect(axle).toMatchObject({ fluid: null, fluidVerdict: null });
		expect(await listOutOfSpec(f.shop.id, f.job.id)).toEqual([]);
	});

	it('refuses a fluid verdict outside the three words (database check)', async () => {
		const f = await oilJob('Fluids check');
		await expect(
			db.insert(s.logEntry).values({
				id: crypto.randomUUID(),
				shopId: f.shop.id,
				jobId: f.job.id,
				jobStepId: f.oil.id,
				authorId: f.tech.id,
				kind: 'measure',
				rawText: 'oil 1.1 l',
				source: 'typed',
				fluidVerdict: 'maybe',
				occurredAt: new Date()
			})
		).rejects.toThrow();
	});
});
