import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from './index';
import { logMeasurement, makeShop } from './fixtures';
import { logEntry } from './schema';

/** Drizzle wraps the database error; the trigger's own words are in its cause. */
function refusedAsAppendOnly(err: unknown): boolean {
	const cause = (err as { cause?: { message?: string } }).cause;
	return /append-only/.test(cause?.message ?? String(err));
}

describe('log_entry is append-only in the database', () => {
	it('accepts a new entry', async () => {
		const f = await makeShop('Append');
		const row = await logMeasurement(f, 88, 'in');
		const [back] = await db.select().from(logEntry).where(eq(logEntry.id, row.id));
		expect(back.value).toBe(88);
		expect(back.seq).toBeGreaterThan(0);
	});

	it('refuses an UPDATE', async () => {
		const f = await makeShop('Append');
		const row = await logMeasurement(f, 70, 'low');
		await expect(
			db.update(logEntry).set({ verdict: 'in' }).where(eq(logEntry.id, row.id))
		).rejects.toSatisfy(refusedAsAppendOnly);
		const [back] = await db.select().from(logEntry).where(eq(logEntry.id, row.id));
		expect(back.verdict).toBe('low');
	});

	it('refuses a DELETE', async () => {
		const f = await makeShop('Append');
		const row = await logMeasurement(f, 70, 'low');
		await expect(db.delete(logEntry).where(eq(logEntry.id, row.id))).rejects.toSatisfy(
			refusedAsAppendOnly
		);
		const rows = await db.select().from(logEntry).where(eq(logEntry.id, row.id));
		expect(rows).toHaveLength(1);
	});

	it('refuses TRUNCATE', async () => {
		await expect(db.execute('truncate log_entry cascade')).rejects.toSatisfy(refusedAsAppendOnly);
	});

	it('takes a correction as a new entry and leaves the withdrawn one as it was', async () => {
		const f = await makeShop('Append');
		const wrong = await logMeasurement(f, 8.8, 'low');
		const retraction = (over: Partial<typeof logEntry.$inferInsert>) =>
			db.insert(logEntry).values({
				id: crypto.randomUUID(),
				shopId: f.shop.id,
				jobId: f.job.id,
				jobStepId: f.step.id,
				authorId: f.tech.id,
				kind: 'retraction',
				rawText: 'undo',
				source: 'typed',
				retracts: wrong.id,
				occurredAt: new Date(),
				...over
			});
		await retraction({});
		// A retraction must name an entry that exists: the database refuses one that names none.
		await expect(retraction({ retracts: crypto.randomUUID() })).rejects.toThrow();
		const rows = await db
			.select()
			.from(logEntry)
			.where(eq(logEntry.jobId, f.job.id))
			.orderBy(logEntry.seq);
		expect(rows.map((r) => [r.kind, r.value, r.verdict, r.retracts])).toEqual([
			['measure', 8.8, 'low', null],
			['retraction', null, null, wrong.id]
		]);
	});
});
