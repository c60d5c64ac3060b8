import { and, eq } from 'drizzle-orm';
import { answerStatus } from './http';
import { describe, expect, it } from 'vitest';
import { client, db } from './db';
import { entryOf, makeShop } from './db/fixtures';
import * as s from './db/schema';
import { sendToFinalInspection } from './bench/hand-over';
import type { Actor } from './bench/job';
import { listSteps } from './bench/steps';
import { appendEntry, type AppendResult } from './log/append';
import { listEntries } from './log/read';

type Fixture = Awaited<ReturnType<typeof makeShop>>;

const as = (u: { id: string; shopId: string; role: Actor['role'] }): Actor => ({
	id: u.id,
	shopId: u.shopId,
	role: u.role
});

async function addUser(f: Fixture, role: Actor['role'], name: string) {
	const [u] = await db
		.insert(s.user)
		.values({
			shopId: f.shop.id,
			email: `${role}-${crypto.randomUUID().slice(0, 8)}@test.test`,
			name,
			role,
			passwordHash: 'x'
		})
		.returning();
	return u;
}

const post = (text: string, extra: Record<string, unknown> = {}) => ({
	id: crypto.randomUUID(),
	text,
	source: 'typed' as const,
	...extra
});

async function rowsOf(f: Fixture) {
	return db.select().from(s.logEntry).where(eq(s.logEntry.jobId, f.job.id));
}

describe('appendEntry', () => {
	it('stores the verdict the server reads and converts into the spec unit', async () => {
		const f = await makeShop('Bench');
		// 10 kgf·m = 98.0665 N·m (NIST SP 811 B.8: 1 kgf = 9.80665 N): over the 80–96 N·m band
		const r = await appendEntry(as(f.tech), f.job.id, post('rear axle 10 kgf m'));
		expect(answerStatus(r)).toBe(201);
		const e = entryOf(r);
		expect(e).toMatchObject({ kind: 'measure', value: 10, unit: 'kgf.m', specUnit: 'N.m' });
		expect(e.specValue).toBeCloseTo(98.0665, 6);
		expect(e.verdict).toBe('high');
		const [row] = await rowsOf(f);
		expect(row.verdict).toBe('high');
		expect(row.jobStepId).toBe(f.step.id);
	});

	it('answers with the entry exactly as the log reads it back', async () => {
		const f = await makeShop('Bench');
		const [tool] = await db
			.insert(s.torqueTool)
			.values({
				shopId: f.shop.id,
				identifier: 'T-2',
				kind: 'Type II class A click',
				rangeMin: 40,
				rangeMax: 200,
				unit: 'N.m',
				calibratedOn: '2026-11-01'
			})
			.returning();
		const stored = [
			entryOf(
				await appendEntry(as(f.tech), f.job.id, post('rear axle 90 nm', { torqueToolId: tool.id }))
			),
			entryOf(
				await appendEntry(as(f.tech), f.job.id, post('note thread chased', { source: 'voice' }))
			)
		];
		const { entries } = await listEntries(f.shop.id, f.job.id);
		expect(entries.slice().reverse()).toEqual(stored);
		expect(stored[0]).toMatchObject({ torqueTool: 'T-2', specMin: 80, specMax: 96, photos: [] });
	});

	it('is idempotent by the device-made id: a repeat answers 200 and writes nothing', async () => {
		const f = await makeShop('Bench');
		const body = post('rear axle 88 nm');
		const first = await appendEntry(as(f.tech), f.job.id, body);
		const again = await appendEntry(as(f.tech), f.job.id, { ...body, text: 'rear axle 50 nm' });
		expect(answerStatus(first)).toBe(201);
		expect(answerStatus(again)).toBe(200);
		expect(entryOf(again).verdict).toBe('in');
		expect(await rowsOf(f)).toHaveLength(1);
	});

	it("answers 404 for another shop's job and for an unknown one, saying nothing about it", async () => {
		const a = await makeShop('Shop A');
		const b = await makeShop('Shop B');
		const r = await appendEntry(as(b.owner), a.job.id, post('rear axle 88 nm'));
		expect(r).toEqual({ ok: false, kind: 'not_found', message: 'No such job.' });
		const unknown = await appendEntry(as(a.owner), crypto.randomUUID(), post('rear axle 88 nm'));
		expect(unknown).toEqual({ ok: false, kind: 'not_found', message: 'No such job.' });
		expect(await listSteps(b.shop.id, a.job.id)).toEqual([]);
		expect((await listEntries(b.shop.id, a.job.id)).entries).toEqual([]);
		expect(await rowsOf(a)).toHaveLength(0);
	});

	it('lets a technician log only on jobs assigned to them; a foreman on any job', async () => {
		const f = await makeShop('Bench');
		const other = await addUser(f, 'technician', 'Other tech');
		const writer = await addUser(f, 'service_writer', 'Desk');
		const foreman = await addUser(f, 'foreman', 'Foreman');
		expect(answerStatus(await appendEntry(as(other), f.job.id, post('rear axle 88 nm')))).toBe(403);
		expect(answerStatus(await appendEntry(as(writer), f.job.id, post('rear axle 88 nm')))).toBe(
			403
		);
		expect(answerStatus(await appendEntry(as(foreman), f.job.id, post('rear axle 88 nm')))).toBe(
			201
		);
	});

	it('answers "next" and "spec" without writing', async () => {
		const f = await makeShop('Bench');
		const next = await appendEntry(as(f.tech), f.job.id, post('next'));
		expect(next).toMatchObject({ ok: true, answer: { intent: 'next' } });
		const spec = await appendEntry(as(f.tech), f.job.id, post('spec rear axle'));
		expect(spec).toMatchObject({ ok: true, answer: { intent: 'spec' } });
		if ('answer' in spec) expect(spec.answer.message).toContain('80 N·m – 96 N·m');
		expect(await rowsOf(f)).toHaveLength(0);
	});

	it('refuses a phrase it cannot log with a message (422)', async () => {
		const f = await makeShop('Bench');
		const r = await appendEntry(as(f.tech), f.job.id, post('carburettor sync 4 mm'));
		expect(answerStatus(r)).toBe(422);
		expect(await rowsOf(f)).toHaveLength(0);
	});

	it('keeps a phrase time and never stores a time ahead of the server beyond clock skew', async () => {
		const f = await makeShop('Bench', { jobOpenedAt: new Date('2026-12-02T08:00:00Z') });
		const now = new Date('2026-12-02T10:00:00Z');
		const future = await appendEntry(
			as(f.tech),
			f.job.id,
			post('rear axle 88 nm', { occurredAt: '2026-12-02T11:00:00Z' }),
			now
		);
		expect(entryOf(future).occurredAt).toBe(now.toISOString());
		const past = await appendEntry(
			as(f.tech),
			f.job.id,
			post('rear axle 90 nm', { occurredAt: '2026-12-02T09:15:00Z' }),
			now
		);
		expect(entryOf(past).occurredAt).toBe('2026-12-02T09:15:00.000Z');
		const ago = await appendEntry(
			as(f.tech),
			f.job.id,
			post('rear axle 90 nm 5 minutes ago', { occurredAt: '2026-12-02T09:30:00Z' }),
			now
		);
		expect(entryOf(ago).occurredAt).toBe('2026-12-02T09:25:00.000Z');
	});

	it('reads "at 10:30" on the shop\'s clock, also once the job is known to this process', async () => {
		// the job card is opened before the entries' fixed clock (back-dating is bounded by it)
		const f = await makeShop('Bench', { jobOpenedAt: new Date('2026-12-01T08:00:00Z') });
		await db.update(s.shop).set({ timeZone: 'Europe/Berlin' }).where(eq(s.shop.id, f.shop.id));
		const now = new Date('2026-12-02T15:00:00Z');
		// Europe/Berlin keeps CET, UTC+1, in December (IANA time zone database): 10:30 there is
		// 09:30 UTC. The server itself runs on UTC here, where 10:30 would read as 10:30 UTC.
		const first = await appendEntry(as(f.tech), f.job.id, post('rear axle 88 nm at 10:30'), now);
		expect(entryOf(first).occurredAt).toBe('2026-12-02T09:30:00.000Z');
		// the quick path (steps and tolerance known by now) must not read it in the server's zone
		const plain = await appendEntry(as(f.tech), f.job.id, post('rear axle 89 nm'), now);
		expect(answerStatus(plain)).toBe(201);
		const again = await appendEntry(as(f.tech), f.job.id, post('rear axle 90 nm at 10:45'), now);
		expect(entryOf(again).occurredAt).toBe('2026-12-02T09:45:00.000Z');
		// the day is the one the entry was typed on, on the shop's calendar: typed offline just
		// after midnight in Berlin (23:10 UTC the day before), "at 00:05" is that Berlin day
		const late = await appendEntry(
			as(f.tech),
			f.job.id,
			post('rear axle 90 nm at 00:05', { occurredAt: '2026-12-01T23:10:00Z' }),
			now
		);
		expect(entryOf(late).occurredAt).toBe('2026-12-01T23:05:00.000Z');
	});

	it('records the torque tool and whether its calibration was overdue', async () => {
		const f = await makeShop('Bench', { jobOpenedAt: new Date('2026-12-02T08:00:00Z') });
		const [tool] = await db
			.insert(s.torqueTool)
			.values({
				shopId: f.shop.id,
				identifier: 'T-1',
				kind: 'Type II class A click',
				rangeMin: 40,
				rangeMax: 200,
				unit: 'N.m',
				calibratedOn: '2025-01-10'
			})
			.returning();
		const e = entryOf(
			await appendEntry(
				as(f.tech),
				f.job.id,
				post('rear axle 88 nm', { torqueToolId: tool.id }),
				new Date('2026-12-02T10:00:00Z')
			)
		);
		expect(e).toMatchObject({ torqueToolId: tool.id, toolCalibrationOverdue: true });
		const b = await makeShop('Other');
		const refused = await appendEntry(
			as(b.tech),
			b.job.id,
			post('rear axle 88 nm', { torqueToolId: tool.id })
		);
		expect(answerStatus(refused)).toBe(422);
	});
});

describe('the steps kept in memory between appends', () => {
	const version = async (f: Fixture) =>
		(await db.select({ v: s.job.stepsVersion }).from(s.job).where(eq(s.job.id, f.job.id)))[0].v;

	it("reads a step edited on the job at the next append, and never another shop's job", async () => {
		const f = await makeShop('Bench');
		// Rear axle nut 80–96 N·m (fixture): 88 is in
		expect(entryOf(await appendEntry(as(f.tech), f.job.id, post('rear axle 88 nm'))).verdict).toBe(
			'in'
		);
		// edited directly in the database, as any writer might: the next append sees it
		await db.update(s.jobStep).set({ min: 90, max: 100 }).where(eq(s.jobStep.id, f.step.id));
		const low = entryOf(await appendEntry(as(f.tech), f.job.id, post('rear axle 88 nm')));
		expect(low).toMatchObject({ verdict: 'low', specMin: 90, specMax: 100 });
		await db
			.update(s.jobStep)
			.set({ label: 'Swingarm pivot nut' })
			.where(eq(s.jobStep.id, f.step.id));
		const renamed = entryOf(await appendEntry(as(f.tech), f.job.id, post('swingarm pivot 95 nm')));
		expect(renamed).toMatchObject({
			stepId: f.step.id,
			stepLabel: 'Swingarm pivot nut',
			verdict: 'in'
		});
		const b = await makeShop('Other');
		expect(
			answerStatus(await appendEntry(as(b.owner), f.job.id, post('swingarm pivot 95 nm')))
		).toBe(404);
	});

	it('follows a reassignment: the former technician is refused, the new one may log', async () => {
		const f = await makeShop('Bench');
		const next = await addUser(f, 'technician', 'Next tech');
		expect(answerStatus(await appendEntry(as(f.tech), f.job.id, post('rear axle 88 nm')))).toBe(
			201
		);
		expect(answerStatus(await appendEntry(as(f.tech), f.job.id, post('rear axle 89 nm')))).toBe(
			201
		);
		await db.update(s.job).set({ technicianId: next.id }).where(eq(s.job.id, f.job.id));
		expect(answerStatus(await appendEntry(as(f.tech), f.job.id, post('rear axle 90 nm')))).toBe(
			403
		);
		expect(answerStatus(await appendEntry(as(next), f.job.id, post('rear axle 90 nm')))).toBe(201);
		expect(await rowsOf(f)).toHaveLength(3);
	});

	it('reads a step added to the job, and the shop tolerance as it is now', async () => {
		const f = await makeShop('Bench');
		expect(answerStatus(await appendEntry(as(f.tech), f.job.id, post('rear axle 88 nm')))).toBe(
			201
		);
		expect(
			answerStatus(await appendEntry(as(f.tech), f.job.id, post('brake disc bolt 54 nm')))
		).toBe(422);
		const [added] = await db
			.insert(s.jobStep)
			.values({
				shopId: f.shop.id,
				jobId: f.job.id,
				jobProcedureId: f.step.jobProcedureId,
				position: 2,
				label: 'Brake disc bolt',
				unit: 'N.m',
				nominal: 50
			})
			.returning();
		// nominal 50 N·m with the shop tolerance (10 % by default): 54 is in, and high at 5 %
		const within = entryOf(await appendEntry(as(f.tech), f.job.id, post('brake disc bolt 54 nm')));
		expect(within).toMatchObject({ stepId: added.id, verdict: 'in' });
		await db.update(s.shop).set({ defaultTolerancePct: 5 }).where(eq(s.shop.id, f.shop.id));
		const over = entryOf(await appendEntry(as(f.tech), f.job.id, post('brake disc bolt 54 nm')));
		expect(over).toMatchObject({ stepId: added.id, verdict: 'high' });
	});

	it("bumps the job's steps version once per statement that changes its steps or procedures", async () => {
		const f = await makeShop('Bench');
		const v0 = await version(f);
		await db.insert(s.jobStep).values(
			[2, 3, 4].map((position) => ({
				shopId: f.shop.id,
				jobId: f.job.id,
				jobProcedureId: f.step.jobProcedureId,
				position,
				label: `Spoke ${position}`
			}))
		);
		expect(await version(f)).toBe(v0 + 1);
		await db
			.update(s.jobProcedure)
			.set({ name: 'Wheels, renamed' })
			.where(eq(s.jobProcedure.id, f.step.jobProcedureId));
		expect(await version(f)).toBe(v0 + 2);
		await db.delete(s.jobStep).where(eq(s.jobStep.label, 'Spoke 4'));
		expect(await version(f)).toBe(v0 + 3);
		const other = await makeShop('Other');
		const otherBefore = await version(other);
		await db.update(s.jobStep).set({ caution: 'Hot' }).where(eq(s.jobStep.id, f.step.id));
		expect(await version(other)).toBe(otherBefore);
	});
});

describe('a step picked from the candidates', () => {
	it('judges the value against the picked step, and refuses a step of another job', async () => {
		const f = await makeShop('Bench');
		const [front] = await db
			.insert(s.jobStep)
			.values({
				shopId: f.shop.id,
				jobId: f.job.id,
				jobProcedureId: f.step.jobProcedureId,
				position: 2,
				label: 'Front axle nut',
				unit: 'N.m',
				min: 55,
				max: 65
			})
			.returning();
		const e = entryOf(
			await appendEntry(as(f.tech), f.job.id, post('rear axle nut 60 nm', { stepId: front.id }))
		);
		expect(e).toMatchObject({ stepId: front.id, verdict: 'in' });
		const other = await makeShop('Other');
		const refused = await appendEntry(
			as(f.tech),
			f.job.id,
			post('rear axle nut 60 nm', { stepId: other.step.id })
		);
		expect(answerStatus(refused)).toBe(422);
	});
});

describe('retraction', () => {
	it("undo retracts the author's own last live entry, and the step is no longer done", async () => {
		const f = await makeShop('Bench');
		const foreman = await addUser(f, 'foreman', 'Foreman');
		const mine = entryOf(await appendEntry(as(f.tech), f.job.id, post('rear axle 70 nm')));
		const theirs = entryOf(await appendEntry(as(foreman), f.job.id, post('note checked')));
		const undo = entryOf(await appendEntry(as(f.tech), f.job.id, post('undo')));
		expect(undo).toMatchObject({ kind: 'retraction', retracts: mine.id });
		expect((await listSteps(f.shop.id, f.job.id))[0].done).toBe(false);
		const { entries } = await listEntries(f.shop.id, f.job.id);
		expect(entries.find((e) => e.id === mine.id)?.retractedBy?.id).toBe(undo.id);
		expect(entries.find((e) => e.id === theirs.id)?.retractedBy).toBeNull();
		// nothing of the technician's is left to undo
		expect(answerStatus(await appendEntry(as(f.tech), f.job.id, post('undo')))).toBe(422);
	});

	it('lets only the author or a foreman retract a named entry', async () => {
		const f = await makeShop('Bench');
		const foreman = await addUser(f, 'foreman', 'Foreman');
		await db
			.update(s.job)
			.set({ technicianId: null })
			.where(and(eq(s.job.id, f.job.id), eq(s.job.shopId, f.shop.id)));
		const byForeman = entryOf(await appendEntry(as(foreman), f.job.id, post('rear axle 88 nm')));
		await db.update(s.job).set({ technicianId: f.tech.id }).where(eq(s.job.id, f.job.id));
		const denied = await appendEntry(
			as(f.tech),
			f.job.id,
			post('undo', { retracts: byForeman.id })
		);
		expect(answerStatus(denied)).toBe(403);
		const own = entryOf(await appendEntry(as(f.tech), f.job.id, post('rear axle 90 nm')));
		const named = entryOf(
			await appendEntry(as(foreman), f.job.id, post('undo', { retracts: own.id }))
		);
		expect(named.retracts).toBe(own.id);
		const twice = await appendEntry(as(foreman), f.job.id, post('undo', { retracts: own.id }));
		expect(twice).toMatchObject({
			kind: 'unprocessable',
			message: 'That entry is already retracted.'
		});
	});

	it('two undos at once retract two different entries', async () => {
		const f = await makeShop('Bench');
		const a = entryOf(await appendEntry(as(f.tech), f.job.id, post('rear axle 85 nm')));
		const b = entryOf(await appendEntry(as(f.tech), f.job.id, post('rear axle 86 nm')));
		const [u1, u2] = await Promise.all([
			appendEntry(as(f.tech), f.job.id, post('undo')),
			appendEntry(as(f.tech), f.job.id, post('undo'))
		]);
		expect([entryOf(u1).retracts, entryOf(u2).retracts].sort()).toEqual([a.id, b.id].sort());
	});
});

describe('appends of the same moment (group commit)', () => {
	/** The transactions that wrote these entries: rows written together share one xmin. */
	async function writers(ids: string[]) {
		const rows = await client<{ xmin: string }[]>`
			select xmin::text from log_entry where id = any(${ids}::uuid[])`;
		return new Set(rows.map((r) => r.xmin)).size;
	}

	it('writes them in one transaction, each with its own verdict and answer', async () => {
		const f = await makeShop('Bench');
		// the first append reads the job; the ones after it take the batched path
		expect(answerStatus(await appendEntry(as(f.tech), f.job.id, post('rear axle 88 nm')))).toBe(
			201
		);
		// Rear axle nut 80–96 N·m (fixture): 70 low, 88 in, 120 high
		const values = Array.from({ length: 30 }, (_, i) => [70, 88, 120][i % 3]);
		const posts = values.map((v) => post(`rear axle ${v} nm`));
		const results = await Promise.all(posts.map((p) => appendEntry(as(f.tech), f.job.id, p)));
		expect(results.map((r) => answerStatus(r))).toEqual(values.map(() => 201));
		expect(results.map((r) => entryOf(r).verdict)).toEqual(
			values.map((v) => (v === 70 ? 'low' : v === 88 ? 'in' : 'high'))
		);
		expect(results.map((r) => entryOf(r).id)).toEqual(posts.map((p) => p.id));
		const seqs = results.map((r) => entryOf(r).seq);
		expect(new Set(seqs).size).toBe(30);
		expect(await writers(posts.map((p) => p.id))).toBe(1);
		expect(await rowsOf(f)).toHaveLength(31);
	});

	it('gathers the appends that arrive while a batch is on its way into the next one', async () => {
		const f = await makeShop('Bench');
		expect(answerStatus(await appendEntry(as(f.tech), f.job.id, post('rear axle 88 nm')))).toBe(
			201
		);
		const waves = [89, 90, 91].map((v) =>
			Array.from({ length: 10 }, () => post(`rear axle ${v} nm`))
		);
		// A batch leaves at the end of the turn its first append arrived in (setImmediate, queued
		// after the first one awaited here). The job row is held here meanwhile, so the first
		// batch waits on its way (its foreign-key check needs the row): the two waves after it
		// arrive while it is out, and go together after it.
		const nextTurn = () => new Promise((r) => setImmediate(r));
		const sent: Promise<AppendResult>[] = [];
		await client.begin(async (tx) => {
			await tx`select id from job where id = ${f.job.id} for update`;
			for (const wave of waves) {
				sent.push(...wave.map((p) => appendEntry(as(f.tech), f.job.id, p)));
				await nextTurn();
				await nextTurn();
			}
			await new Promise((r) => setTimeout(r, 50));
		});
		expect((await Promise.all(sent)).map((r) => answerStatus(r))).toEqual(sent.map(() => 201));
		const ids = waves.map((wave) => wave.map((p) => p.id));
		expect(await writers(ids[0])).toBe(1);
		expect(await writers([...ids[1], ...ids[2]])).toBe(1);
		expect(await writers(ids.flat())).toBe(2);
	});

	it('answers the same id sent twice at once with one 201 and one 200, storing it once', async () => {
		const f = await makeShop('Bench');
		expect(answerStatus(await appendEntry(as(f.tech), f.job.id, post('rear axle 88 nm')))).toBe(
			201
		);
		const twice = post('rear axle 90 nm');
		const results = await Promise.all([
			appendEntry(as(f.tech), f.job.id, twice),
			appendEntry(as(f.tech), f.job.id, twice),
			appendEntry(as(f.tech), f.job.id, post('rear axle 91 nm'))
		]);
		expect(results.map((r) => answerStatus(r)).sort()).toEqual([200, 201, 201]);
		expect(entryOf(results[0]).seq).toBe(entryOf(results[1]).seq);
		expect(await rowsOf(f)).toHaveLength(3);
	});

	it('keeps the rules in a batch: another technician is refused, another shop sees a 404', async () => {
		const f = await makeShop('Bench');
		const other = await addUser(f, 'technician', 'Not assigned');
		const b = await makeShop('Other');
		expect(answerStatus(await appendEntry(as(f.tech), f.job.id, post('rear axle 88 nm')))).toBe(
			201
		);
		const results = await Promise.all([
			appendEntry(as(f.tech), f.job.id, post('rear axle 89 nm')),
			appendEntry(as(other), f.job.id, post('rear axle 89 nm')),
			appendEntry(as(b.owner), f.job.id, post('rear axle 89 nm')),
			appendEntry(as(f.tech), f.job.id, post('rear axle 90 nm'))
		]);
		expect(results.map((r) => answerStatus(r))).toEqual([201, 403, 404, 201]);
		expect(await rowsOf(f)).toHaveLength(3);
	});

	it('does not let one entry the database refuses take the others of its batch with it', async () => {
		const f = await makeShop('Bench');
		const tag = crypto.randomUUID().slice(0, 8);
		const poison = `refuse-${tag}`;
		// A trigger that refuses one marked note, as a constraint or a failing disk might refuse
		// one row: the batch statement fails, and each entry is then tried on its own.
		await client.unsafe(`
			create function refuse_${tag}() returns trigger language plpgsql as $$
			begin
				if new.raw_text like '%${poison}%' then raise exception 'refused for the test'; end if;
				return new;
			end $$;
			create trigger refuse_${tag} before insert on log_entry
				for each row execute function refuse_${tag}();`);
		try {
			expect(answerStatus(await appendEntry(as(f.tech), f.job.id, post('rear axle 88 nm')))).toBe(
				201
			);
			const settled = await Promise.allSettled([
				appendEntry(as(f.tech), f.job.id, post('rear axle 89 nm')),
				appendEntry(as(f.tech), f.job.id, post(`note ${poison}`)),
				appendEntry(as(f.tech), f.job.id, post('rear axle 90 nm'))
			]);
			expect(settled.map((r) => r.status)).toEqual(['fulfilled', 'rejected', 'fulfilled']);
			const values = (await rowsOf(f)).map((r) => r.value).sort();
			expect(values).toEqual([88, 89, 90]);
		} finally {
			await client.unsafe(`
				drop trigger refuse_${tag} on log_entry;
				drop function refuse_${tag}();`);
		}
	});
});

describe('listEntries', () => {
	it('pages newest first by seq', async () => {
		const f = await makeShop('Bench');
		for (const v of [81, 82, 83, 84, 85]) {
			await appendEntry(as(f.tech), f.job.id, post(`rear axle ${v} nm`));
		}
		const p1 = await listEntries(f.shop.id, f.job.id, { limit: 2 });
		expect(p1.entries.map((e) => e.value)).toEqual([85, 84]);
		const p2 = await listEntries(f.shop.id, f.job.id, { limit: 2, before: p1.nextBefore! });
		expect(p2.entries.map((e) => e.value)).toEqual([83, 82]);
		const p3 = await listEntries(f.shop.id, f.job.id, { limit: 2, before: p2.nextBefore! });
		expect(p3.entries.map((e) => e.value)).toEqual([81]);
		expect(p3.nextBefore).toBeNull();
		const newer = await listEntries(f.shop.id, f.job.id, { after: p1.entries[1].seq });
		expect(newer.entries.map((e) => e.value)).toEqual([85]);
	});
});

describe('sendToFinalInspection', () => {
	it('needs a reason while steps are open and records who and when', async () => {
		const f = await makeShop('Bench');
		const refused = await sendToFinalInspection(as(f.tech), f.job.id);
		expect(refused).toMatchObject({ ok: false, kind: 'unprocessable' });
		const ok = await sendToFinalInspection(as(f.tech), f.job.id, 'Axle nut on back order');
		expect(ok).toEqual({ ok: true, state: 'final_inspection' });
		const changes = await db
			.select()
			.from(s.jobStateChange)
			.where(eq(s.jobStateChange.jobId, f.job.id));
		expect(changes).toHaveLength(1);
		expect(changes[0]).toMatchObject({
			fromState: 'in_work',
			toState: 'final_inspection',
			byUserId: f.tech.id,
			reason: 'Axle nut on back order'
		});
	});

	it('goes without a reason when every step is done', async () => {
		const f = await makeShop('Bench');
		await appendEntry(as(f.tech), f.job.id, post('rear axle 88 nm'));
		expect(await sendToFinalInspection(as(f.tech), f.job.id)).toMatchObject({ ok: true });
	});
});

describe('a closed record takes no entries', () => {
	const setState = (f: Fixture, state: (typeof s.job.$inferSelect)['state']) =>
		db.update(s.job).set({ state }).where(eq(s.job.id, f.job.id));

	it('refuses notes, measurements and undo on invoiced, paid and cancelled jobs with a 409', async () => {
		const f = await makeShop('Closed');
		// The first append puts this process's copy of the steps in memory (the group-commit path).
		expect(answerStatus(await appendEntry(as(f.tech), f.job.id, post('rear axle 88 nm')))).toBe(
			201
		);
		for (const state of ['invoiced', 'paid', 'cancelled'] as const) {
			await setState(f, state);
			for (const text of ['rear axle 90 nm', 'note looked again', 'undo']) {
				const r = await appendEntry(as(f.tech), f.job.id, post(text));
				expect(answerStatus(r), `${state}: ${text}`).toBe(409);
				expect('message' in r && r.message).toMatch(/record is closed/);
			}
		}
		expect(await rowsOf(f)).toHaveLength(1);
	});

	it('still answers a retry of an entry stored before the job closed', async () => {
		const f = await makeShop('Closed retry');
		const body = post('rear axle 88 nm');
		const first = entryOf(await appendEntry(as(f.tech), f.job.id, body));
		await setState(f, 'invoiced');
		const again = await appendEntry(as(f.tech), f.job.id, body);
		expect(entryOf(again).id).toBe(first.id);
	});

	it('sends a job ready to invoice back to in work when work is found, then stores it', async () => {
		const f = await makeShop('Found late');
		expect(answerStatus(await appendEntry(as(f.tech), f.job.id, post('rear axle 88 nm')))).toBe(
			201
		);
		await setState(f, 'ready_to_invoice');
		const r = await appendEntry(as(f.tech), f.job.id, post('rear axle 70 nm'));
		expect(answerStatus(r)).toBe(201);
		expect(entryOf(r).verdict).toBe('low');
		const [j] = await db.select().from(s.job).where(eq(s.job.id, f.job.id));
		expect(j.state).toBe('in_work');
		const changes = await db
			.select()
			.from(s.jobStateChange)
			.where(eq(s.jobStateChange.jobId, f.job.id));
		expect(changes.at(-1)).toMatchObject({
			fromState: 'ready_to_invoice',
			toState: 'in_work',
			reason: expect.stringMatching(/Work found/)
		});
	});
});

describe('an entry dated before its job was opened', () => {
	const opened = new Date('2026-12-02T08:00:00Z');
	const now = new Date('2026-12-02T10:00:00Z');

	it('is refused with words beyond a day before the opening, on either append path', async () => {
		const f = await makeShop('Opened', { jobOpenedAt: opened });
		// 23 hours before the opening is still allowed (the card typed up the morning after)
		const early = await appendEntry(
			as(f.tech),
			f.job.id,
			post('rear axle 88 nm', { occurredAt: '2026-12-01T09:00:00Z' }),
			now
		);
		expect(entryOf(early).occurredAt).toBe('2026-12-01T09:00:00.000Z');
		// the job's steps are now in memory: this one would go through the group-commit path
		for (const body of [
			post('rear axle 90 nm', { occurredAt: '2026-12-01T07:59:00Z' }),
			post('rear axle 90 nm', { occurredAt: '2026-11-02T10:00:00Z' }),
			post('rear axle 90 nm yesterday at 07:30')
		]) {
			const r = await appendEntry(as(f.tech), f.job.id, body, now);
			expect(r, body.text).toEqual({
				ok: false,
				kind: 'unprocessable',
				message: expect.stringMatching(/more than a day before this job card was opened/)
			});
		}
		expect(await rowsOf(f)).toHaveLength(1);
	});

	it('is refused on the first append too (the full path), and for an undo', async () => {
		const f = await makeShop('Opened first', { jobOpenedAt: opened });
		const old = { occurredAt: '2026-11-30T10:00:00Z' };
		expect(
			answerStatus(await appendEntry(as(f.tech), f.job.id, post('rear axle 88 nm', old), now))
		).toBe(422);
		expect(
			answerStatus(await appendEntry(as(f.tech), f.job.id, post('rear axle 88 nm'), now))
		).toBe(201);
		expect(answerStatus(await appendEntry(as(f.tech), f.job.id, post('undo', old), now))).toBe(422);
		expect(await rowsOf(f)).toHaveLength(1);
	});
});
