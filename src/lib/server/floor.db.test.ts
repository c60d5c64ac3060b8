import { eq } from 'drizzle-orm';
import { failureStatus, type Result } from '$lib/result';
import { describe, expect, it } from 'vitest';
import { db } from './db';
import { logMeasurement, makeShop } from './db/fixtures';
import * as s from './db/schema';
import {
	getInspection,
	markReadyToInvoice,
	readyToInvoiceBlockers,
	setInspectionTick,
	signOff
} from './floor/inspection';
import { announcedEntries, listLog, entriesSince } from './floor/log';
import { acceptEntry, listOpenRedos, listOutOfSpec, orderRedo } from './floor/queue';
import { listJobs } from './jobs';

async function withForeman(f: Awaited<ReturnType<typeof makeShop>>) {
	const [foreman] = await db
		.insert(s.user)
		.values({
			shopId: f.shop.id,
			email: `foreman-${crypto.randomUUID().slice(0, 8)}@test.test`,
			name: 'Foreman',
			role: 'foreman',
			passwordHash: 'x'
		})
		.returning();
	const items = await db
		.insert(s.inspectionItem)
		.values([
			{ shopId: f.shop.id, label: 'No leaks', position: 1 },
			{ shopId: f.shop.id, label: 'Test ride', position: 2 }
		])
		.returning();
	return { ...f, foreman: { id: foreman.id, shopId: f.shop.id, name: foreman.name }, items };
}

/** The HTTP status a refusal answers with (the one mapping, $lib/result), or null when done. */
async function statusOf(p: Promise<Result>): Promise<number | null> {
	const r = await p;
	return r.ok ? null : failureStatus[r.kind];
}

/** A change that must succeed. */
async function done<T extends Result>(p: Promise<T>): Promise<T> {
	const r = await p;
	expect(r).toMatchObject({ ok: true });
	return r;
}

describe('out-of-spec queue', () => {
	it('lists the latest out-of-spec value of a step until it is accepted', async () => {
		const f = await withForeman(await makeShop('Queue'));
		await logMeasurement(f, 85, 'in');
		const over = await logMeasurement(f, 101, 'high');
		const queue = await listOutOfSpec(f.shop.id);
		expect(queue.map((q) => q.entryId)).toEqual([over.id]);
		expect(queue[0]).toMatchObject({ verdict: 'high', stepLabel: 'Rear axle nut', max: 96 });

		await done(acceptEntry(f.foreman, over.id, 'Within the wheel maker tolerance, checked twice'));
		expect(await listOutOfSpec(f.shop.id)).toEqual([]);
		// Answering twice is refused: the entry is no longer waiting.
		expect(await statusOf(acceptEntry(f.foreman, over.id, 'again please'))).toBe(409);

		const [accept] = await db.select().from(s.logEntry).where(eq(s.logEntry.respondsTo, over.id));
		expect(accept).toMatchObject({ kind: 'accept', authorId: f.foreman.id });
		expect(accept.note).toContain('tolerance');
	});

	it('a redo reopens the step until a new entry; an in-spec value clears it', async () => {
		const f = await withForeman(await makeShop('Redo'));
		const low = await logMeasurement(f, 60, 'low');
		const stepsDone = async () =>
			(await listJobs(f.shop.id)).find((j) => j.id === f.job.id)?.stepsDone;
		expect(await stepsDone()).toBe(1);
		await done(orderRedo(f.foreman, low.id, 'Torque again with TW-02 and log it'));
		expect(await listOutOfSpec(f.shop.id)).toEqual([]);
		// The step counts as not done again until a new entry.
		expect(await stepsDone()).toBe(0);
		const redos = await listOpenRedos(f.shop.id, f.job.id);
		expect(redos).toHaveLength(1);
		expect(redos[0]).toMatchObject({
			stepLabel: 'Rear axle nut',
			note: 'Torque again with TW-02 and log it',
			foremanName: 'Foreman'
		});
		await logMeasurement(f, 88, 'in');
		expect(await listOpenRedos(f.shop.id, f.job.id)).toEqual([]);
		expect(await stepsDone()).toBe(1);
		expect(await listOutOfSpec(f.shop.id)).toEqual([]);
	});

	it('a retracted out-of-spec value leaves the queue', async () => {
		const f = await withForeman(await makeShop('Retract'));
		const over = await logMeasurement(f, 120, 'high');
		await db.insert(s.logEntry).values({
			id: crypto.randomUUID(),
			shopId: f.shop.id,
			jobId: f.job.id,
			authorId: f.tech.id,
			kind: 'retraction',
			rawText: 'undo',
			source: 'typed',
			retracts: over.id,
			occurredAt: new Date()
		});
		expect(await listOutOfSpec(f.shop.id)).toEqual([]);
	});

	it('another shop sees nothing and cannot answer', async () => {
		const a = await withForeman(await makeShop('A'));
		const b = await withForeman(await makeShop('B'));
		const over = await logMeasurement(a, 130, 'high');
		expect(await listOutOfSpec(b.shop.id)).toEqual([]);
		expect((await listLog(b.shop.id, {})).entries).toEqual([]);
		expect(await statusOf(acceptEntry(b.foreman, over.id, 'not mine'))).toBe(404);
		expect(await getInspection(b.shop.id, a.job.id)).toBeNull();
	});
});

describe('running log', () => {
	it('pages newest first by seq and filters by verdict and step text', async () => {
		const f = await withForeman(await makeShop('Log'));
		const made = [];
		for (let i = 0; i < 5; i++)
			made.push(await logMeasurement(f, 80 + i * 5, i === 4 ? 'high' : 'in'));
		const first = await listLog(f.shop.id, {}, undefined, 3);
		expect(first.entries.map((e) => e.id)).toEqual([made[4].id, made[3].id, made[2].id]);
		expect(first.more).toBe(true);
		const second = await listLog(f.shop.id, {}, first.entries[2].seq, 3);
		expect(second.entries.map((e) => e.id)).toEqual([made[1].id, made[0].id]);
		expect(second.more).toBe(false);
		expect((await listLog(f.shop.id, { verdict: 'out' })).entries.map((e) => e.id)).toEqual([
			made[4].id
		]);
		expect((await listLog(f.shop.id, { q: 'axle' })).entries).toHaveLength(5);
		expect((await listLog(f.shop.id, { q: '100%' })).entries).toHaveLength(0);
	});

	it('catch-up re-scans below the last seq seen, so a late commit is not skipped', async () => {
		const f = await withForeman(await makeShop('Catch-up'));
		const a = await logMeasurement(f, 81, 'in');
		const b = await logMeasurement(f, 82, 'in');
		const since = await entriesSince(f.shop.id, b.seq);
		// `a` sits below the resume point yet is returned: the browser drops ids it holds.
		expect(since.map((e) => e.id)).toEqual([a.id, b.id]);
	});

	it("live streams share reads of announced entries, in seq order, never another shop's", async () => {
		const f = await withForeman(await makeShop('Announced'));
		const other = await makeShop('Announced other');
		const a = await logMeasurement(f, 81, 'in');
		const b = await logMeasurement(f, 99, 'high');
		const theirs = await logMeasurement(other, 85, 'in');
		// five streams asking at once, as five foremen's would
		const reads = await Promise.all(
			Array.from({ length: 5 }, () => announcedEntries(f.shop.id, [b.id, a.id, theirs.id]))
		);
		for (const r of reads) expect(r.map((e) => e.id)).toEqual([a.id, b.id]);
		expect(await announcedEntries(other.shop.id, [a.id])).toEqual([]);
		expect((await announcedEntries(other.shop.id, [theirs.id])).map((e) => e.id)).toEqual([
			theirs.id
		]);
	});
});

describe('final inspection and sign-off', () => {
	it('needs every item ticked and no open out-of-spec entry; then records who and when', async () => {
		const f = await withForeman(await makeShop('Sign-off'));
		await db.update(s.job).set({ state: 'final_inspection' }).where(eq(s.job.id, f.job.id));
		const over = await logMeasurement(f, 99, 'high');

		expect(readyToInvoiceBlockers((await getInspection(f.shop.id, f.job.id))!)).toHaveLength(2);
		expect(await statusOf(markReadyToInvoice(f.foreman, f.job.id))).toBe(409);

		await done(setInspectionTick(f.foreman, f.job.id, f.items[0].id, true));
		await done(setInspectionTick(f.foreman, f.job.id, f.items[1].id, true));
		await done(setInspectionTick(f.foreman, f.job.id, f.items[1].id, false));
		let state = (await getInspection(f.shop.id, f.job.id))!;
		expect(state.items.map((i) => i.tickedBy)).toEqual(['Foreman', null]);
		expect(await statusOf(signOff(f.foreman, f.job.id))).toBe(409);

		await done(setInspectionTick(f.foreman, f.job.id, f.items[1].id, true));
		expect(await statusOf(signOff(f.foreman, f.job.id))).toBe(409); // still out of spec
		await done(acceptEntry(f.foreman, over.id, 'Nut is a new self-locking type, house rule'));
		await done(signOff(f.foreman, f.job.id));
		state = (await getInspection(f.shop.id, f.job.id))!;
		expect(state.job.signedOffBy).toBe('Foreman');
		expect(state.job.signedOffAt).not.toBeNull();
		expect(await statusOf(signOff(f.foreman, f.job.id))).toBe(409);

		await done(markReadyToInvoice(f.foreman, f.job.id));
		const [job] = await db.select().from(s.job).where(eq(s.job.id, f.job.id));
		expect(job.state).toBe('ready_to_invoice');
		const kinds = (await listLog(f.shop.id, {})).entries.map((e) => e.kind);
		expect(kinds).toContain('sign_off');
		expect(kinds.filter((k) => k === 'inspection')).toHaveLength(3);
	});
});
