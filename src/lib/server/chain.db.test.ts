import fc from 'fast-check';
import { answerStatus } from './http';
import postgres from 'postgres';
import { afterAll, describe, expect, it } from 'vitest';
import { config } from '../../../scripts/lib/config.js';
import { canonicalJson } from '../evidence/chain';
import { verifyChains, chainFields, eachChainRow } from './chain-verify';
import { client, db } from './db';
import * as s from './db/schema';
import { logMeasurement, makeShop } from './db/fixtures';
import type { Actor } from './bench/job';
import { appendEntry } from './log/append';

type Fixture = Awaited<ReturnType<typeof makeShop>>;

// A superuser over the cluster's Unix socket (local connections are trusted): the person this
// chain guards against, who can switch the append-only trigger off.
const dbName = new URL(process.env.DATABASE_URL ?? 'postgres://x/benchcall_test').pathname.slice(1);
const admin = postgres({
	host: config.socketDir,
	port: config.pgPort,
	user: 'postgres',
	database: dbName,
	max: 1,
	onnotice: () => {}
});
afterAll(() => admin.end({ timeout: 2 }));

/** Runs `work` with the append-only trigger off, as someone covering their tracks would. */
async function behindTheAppsBack(work: (sql: postgres.TransactionSql) => Promise<unknown>) {
	await admin.begin(async (sql) => {
		await sql`alter table log_entry disable trigger log_entry_no_update_delete`;
		await work(sql);
		await sql`alter table log_entry enable trigger log_entry_no_update_delete`;
	});
}

const tech = (f: Fixture): Actor => ({ id: f.tech.id, shopId: f.shop.id, role: 'technician' });

async function fourEntries(f: Fixture) {
	const rows = [];
	for (const v of [81, 84, 88, 90]) rows.push(await logMeasurement(f, v, 'in'));
	return rows;
}

describe('the job log hash chain', () => {
	it('links each entry of a job to the one before, in the job’s own order', async () => {
		const f = await makeShop('Chain');
		const rows = await fourEntries(f);
		expect(rows.map((r) => r.chainPos)).toEqual([1, 2, 3, 4]);
		expect(rows[0].prevHash).toBeNull();
		for (let i = 1; i < rows.length; i++) expect(rows[i].prevHash).toBe(rows[i - 1].entryHash);
		expect(rows.every((r) => /^[0-9a-f]{64}$/.test(r.entryHash))).toBe(true);
		const report = await verifyChains(client, f.shop.id);
		expect(report).toMatchObject({ jobs: 1, entries: 4, breaks: [] });
	});

	it('chains appends that arrive together (group commit) and alone, with no fork', async () => {
		const f = await makeShop('Chain');
		const posts = Array.from({ length: 24 }, (_, i) => ({
			id: crypto.randomUUID(),
			text: `rear axle ${80 + (i % 10)} nm`,
			source: 'typed' as const
		}));
		const results = await Promise.all(posts.map((p) => appendEntry(tech(f), f.job.id, p)));
		expect(results.every((r) => answerStatus(r) === 201)).toBe(true);
		// A device resending an id it already sent moves nothing.
		const again = await appendEntry(tech(f), f.job.id, posts[3]);
		expect(answerStatus(again)).toBe(200);
		const [head] = await client`select pos from log_chain_head where job_id = ${f.job.id}`;
		expect(head.pos).toBe(24);
		const report = await verifyChains(client, f.shop.id);
		expect(report).toMatchObject({ entries: 24, breaks: [] });
	});

	it('names exactly the entry whose value was changed behind the app’s back', async () => {
		const f = await makeShop('Chain');
		const rows = await fourEntries(f);
		await behindTheAppsBack((sql) => sql`update log_entry set value = 86 where id = ${rows[1].id}`);
		const report = await verifyChains(client, f.shop.id);
		expect(report.breaks).toHaveLength(1);
		expect(report.breaks[0]).toMatchObject({
			jobId: f.job.id,
			entryId: rows[1].id,
			pos: 2,
			reason: 'changed',
			rawText: 'rear axle 84 nm'
		});
	});

	it('names the entry after a deleted one', async () => {
		const f = await makeShop('Chain');
		const rows = await fourEntries(f);
		await behindTheAppsBack((sql) => sql`delete from log_entry where id = ${rows[2].id}`);
		const report = await verifyChains(client, f.shop.id);
		expect(report.breaks).toHaveLength(1);
		expect(report.breaks[0]).toMatchObject({
			entryId: rows[3].id,
			pos: 4,
			reason: 'missing_before'
		});
	});

	it('notices when the newest entry is deleted', async () => {
		const f = await makeShop('Chain');
		const rows = await fourEntries(f);
		await behindTheAppsBack((sql) => sql`delete from log_entry where id = ${rows[3].id}`);
		const report = await verifyChains(client, f.shop.id);
		expect(report.breaks).toHaveLength(1);
		expect(report.breaks[0]).toMatchObject({ entryId: null, pos: 4, reason: 'missing_after' });
	});

	it('finds a hash rewritten to match changed content, at the next link', async () => {
		const f = await makeShop('Chain');
		const rows = await fourEntries(f);
		// The entry's own hash recomputed the database's way: the change now shows one link later.
		await behindTheAppsBack(async (sql) => {
			await sql`update log_entry set value = 95 where id = ${rows[0].id}`;
			await sql`update log_entry e set entry_hash = log_entry_hash(e) where id = ${rows[0].id}`;
		});
		const report = await verifyChains(client, f.shop.id);
		expect(report.breaks).toHaveLength(1);
		expect(report.breaks[0]).toMatchObject({ entryId: rows[1].id, pos: 2, reason: 'link' });
	});

	it('rebuilds the database’s canonical JSON byte for byte, whatever the text and numbers', async () => {
		const f = await makeShop('Chain');
		const text = fc
			.oneof(fc.string({ unit: 'binary-ascii' }), fc.string({ unit: 'grapheme' }))
			.filter((t) => !t.includes('\u0000'));
		await fc.assert(
			fc.asyncProperty(text, fc.double({ noNaN: true, noDefaultInfinity: true }), async (t, v) => {
				const [row] = await db
					.insert(s.logEntry)
					.values({
						id: crypto.randomUUID(),
						shopId: f.shop.id,
						jobId: f.job.id,
						authorId: f.tech.id,
						kind: 'note',
						rawText: t,
						note: t,
						source: 'typed',
						value: v,
						// version 2's columns (drizzle/0012), with the same text and numbers
						fluid: t,
						adapterMm: Math.max(-1000, Math.min(1000, v)),
						toolLengthMm: Math.abs(v) || 1,
						wrenchSetting: Math.abs(v) || 1,
						wrenchSettingUnit: t,
						occurredAt: new Date()
					})
					.returning();
				expect(row.chainV).toBe(2);
				const [db1] = await client`
					select log_entry_canonical(e) as c from log_entry e where id = ${row.id}`;
				let mine = '';
				await eachChainRow(client, { jobId: f.job.id }, (rows) => {
					const found = rows.find((r) => r.id === row.id);
					if (found) mine = canonicalJson(chainFields(found));
				});
				expect(mine).toBe(db1.c);
			}),
			{ numRuns: 40 }
		);
		const report = await verifyChains(client, f.shop.id);
		expect(report).toMatchObject({ entries: 40, breaks: [] });
	});

	it('keeps verifying entries hashed as version 1 before the adapter and grade joined the hash', async () => {
		const f = await makeShop('Chain');
		const [row] = await fourEntries(f);
		// An entry as drizzle/0010 wrote it: version 1, hashed without the new keys. A job with
		// one entry, so its head is the entry itself.
		const g = await makeShop('Chain');
		const [old] = await fourEntries(g).then((r) => r.slice(0, 1));
		await behindTheAppsBack(async (sql) => {
			await sql`delete from log_entry where job_id = ${g.job.id} and chain_pos > 1`;
			await sql`update log_entry set chain_v = 1 where id = ${old.id}`;
			await sql`update log_entry e set entry_hash = log_entry_hash(e) where id = ${old.id}`;
			await sql`update log_chain_head h set pos = 1, hash = e.entry_hash
				from log_entry e where e.id = ${old.id} and h.job_id = e.job_id`;
		});
		const [c] =
			await client`select log_entry_canonical(e) as c from log_entry e where id = ${old.id}`;
		expect(c.c).toContain('"v":"1"');
		expect(c.c).not.toContain('adapter_mm');
		let mine = '';
		await eachChainRow(client, { jobId: g.job.id }, (rows) => {
			mine = canonicalJson(chainFields(rows[0]));
		});
		expect(mine).toBe(c.c);
		expect(await verifyChains(client, g.shop.id)).toMatchObject({ entries: 1, breaks: [] });
		// a version 2 entry carries the new keys
		const [c2] =
			await client`select log_entry_canonical(e) as c from log_entry e where id = ${row.id}`;
		expect(c2.c).toContain('"adapter_mm":null');
		expect(c2.c).toContain('"v":"2"');
		// and a version 1 entry whose grade is changed is not noticed by version 1 (it never held
		// it), while a change to what version 1 did hold is
		await behindTheAppsBack((sql) => sql`update log_entry set value = 70 where id = ${old.id}`);
		expect((await verifyChains(client, g.shop.id)).breaks[0]).toMatchObject({
			entryId: old.id,
			reason: 'changed'
		});
	});
});
