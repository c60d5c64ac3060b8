// A closed record takes nothing more: the database refuses an entry or a photo on a
// job whose record is closed, in the inserting statement, under a row lock on the job
// (drizzle/0013), so a close and an append that race never leave an entry after the close.
import { answerStatus } from './http';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq, sql } from 'drizzle-orm';
import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { client, db } from './db';
import { makeShop } from './db/fixtures';
import * as s from './db/schema';
import type { Actor } from './bench/job';
import { appendEntry } from './log/append';
import { attachPhoto } from './photos';
import { storePhoto } from './photos';
import { localDiskStorage } from './storage';

type Fixture = Awaited<ReturnType<typeof makeShop>>;

const tech = (f: Fixture): Actor => ({ id: f.tech.id, shopId: f.shop.id, role: 'technician' });
const post = (text: string) => ({ id: crypto.randomUUID(), text, source: 'typed' as const });
const entriesOf = (f: Fixture) =>
	db.select({ id: s.logEntry.id }).from(s.logEntry).where(eq(s.logEntry.jobId, f.job.id));

/** Resolves once `cond` holds; rejects after `ms` (polls, no fixed sleep decides anything). */
async function until(cond: () => Promise<boolean>, ms = 5000): Promise<void> {
	const end = Date.now() + ms;
	while (!(await cond())) {
		if (Date.now() > end) throw new Error('condition not reached in time');
		await new Promise((r) => setTimeout(r, 10));
	}
}

/** Some session waits for a row lock while inserting into log_entry. */
async function anInsertWaits(): Promise<boolean> {
	const rows = await client`
		select 1 from pg_stat_activity
		where datname = current_database() and wait_event_type = 'Lock'
			and query ilike '%insert into log_entry%'`;
	return rows.length > 0;
}

/**
 * Closes the job as invoicing does, in one transaction: lock the job, read the log it closes
 * over, mark the job invoiced. Answers the number of entries the close saw.
 */
async function closeReading(f: Fixture): Promise<number> {
	return db.transaction(async (tx) => {
		await tx.execute(sql`select 1 from job where id = ${f.job.id} for update`);
		const [row] = await tx.execute(
			sql`select count(*)::int as n from log_entry where job_id = ${f.job.id}`
		);
		await tx.update(s.job).set({ state: 'invoiced' }).where(eq(s.job.id, f.job.id));
		return row.n as number;
	});
}

describe('a close and an append at the same moment', () => {
	// The close holds the job row while its transaction is open; the append started before it
	// committed must wait, then be refused, on the single-entry path and in a group-commit batch.
	for (const path of ['single-entry', 'group-commit'] as const) {
		it(`never stores an entry after the close (${path} path)`, async () => {
			const f = await makeShop(`Race ${path}`);
			if (path === 'group-commit') {
				// a first append puts the job's steps in this process's memory: the next one is batched
				expect(answerStatus(await appendEntry(tech(f), f.job.id, post('rear axle 88 nm')))).toBe(
					201
				);
			}
			const before = (await entriesOf(f)).length;
			const closer = await client.reserve();
			try {
				await closer`begin`;
				await closer`select 1 from job where id = ${f.job.id} for update`;
				await closer`update job set state = 'invoiced' where id = ${f.job.id}`;
				let settled = false;
				const append = appendEntry(tech(f), f.job.id, post('rear axle 70 nm')).finally(() => {
					settled = true;
				});
				// Without the lock the append does not wait: it stores its entry under the close.
				await until(async () => settled || (await anInsertWaits()));
				await closer`commit`;
				const r = await append;
				expect(answerStatus(r)).toBe(409);
				expect('message' in r && r.message).toMatch(/closed/);
			} finally {
				closer.release();
			}
			expect(await entriesOf(f)).toHaveLength(before);
		});
	}

	it('keeps the log the close read, whichever of the two wins (20 races)', async () => {
		for (let i = 0; i < 20; i++) {
			const f = await makeShop(`Race ${i}`);
			if (i % 2) await appendEntry(tech(f), f.job.id, post('rear axle 88 nm'));
			const [seen, appended] = await Promise.all([
				closeReading(f),
				appendEntry(tech(f), f.job.id, post('rear axle 90 nm'))
			]);
			expect([201, 409], `race ${i}`).toContain(answerStatus(appended));
			// every entry the log holds now was there when the close read it
			expect((await entriesOf(f)).length, `race ${i}`).toBe(seen);
		}
	});

	it('refuses an entry written straight into the table for a closed job', async () => {
		const f = await makeShop('Console');
		await db.update(s.job).set({ state: 'paid' }).where(eq(s.job.id, f.job.id));
		await expect(
			client`insert into log_entry (id, shop_id, job_id, author_id, kind, raw_text, source, occurred_at)
				values (${crypto.randomUUID()}, ${f.shop.id}, ${f.job.id}, ${f.tech.id}, 'note',
					'note late', 'typed', now())`
		).rejects.toMatchObject({ code: 'BC409' });
	});
});

describe('photos on a closed record', () => {
	async function jpeg() {
		return new Uint8Array(
			await sharp({ create: { width: 8, height: 8, channels: 3, background: '#808080' } })
				.jpeg()
				.toBuffer()
		);
	}

	it('are refused with a 409 and words, on the entry and at the storage write', async () => {
		const f = await makeShop('Photo closed');
		const storage = localDiskStorage(mkdtempSync(join(tmpdir(), 'closed-photo-')));
		const stored = await appendEntry(tech(f), f.job.id, post('rear axle 88 nm'));
		if (!('entry' in stored)) throw new Error('no entry');
		const bytes = await jpeg();
		const attach = (name: string) =>
			attachPhoto(tech(f), f.job.id, stored.entry.id, { bytes, name }, storage);
		expect((await attach('a.jpg')).ok).toBe(true);
		await db.update(s.job).set({ state: 'invoiced' }).where(eq(s.job.id, f.job.id));
		expect(await attach('b.jpg')).toEqual({
			ok: false,
			kind: 'conflict',
			message: expect.stringMatching(/record is closed/)
		});
		// the database refuses too, for a writer that did not look (intake photos, a race)
		const raced = await storePhoto(
			{ shopId: f.shop.id, jobId: f.job.id, entryId: null, uploadedBy: f.owner.id },
			{ bytes, name: 'c.jpg' },
			storage
		);
		expect(raced).toMatchObject({ ok: false, kind: 'conflict' });
		const photos = await db.select().from(s.attachment).where(eq(s.attachment.jobId, f.job.id));
		expect(photos).toHaveLength(1);
	});
});
