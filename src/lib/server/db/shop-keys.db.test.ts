// drizzle/0015_shop_keys.sql on a database that already holds a log: it checks the rows first,
// keeps every hash chain whole, and each shop's seq continues from its own highest one.
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { drizzle } from 'drizzle-orm/postgres-js';
import { migrate } from 'drizzle-orm/postgres-js/migrator';
import type { Sql } from 'postgres';
import { afterAll, describe, expect, it } from 'vitest';
import { verifyChains } from '../chain-verify';
import { withScratchDatabase } from './fixtures';

const folders: string[] = [];
afterAll(async () => {
	for (const f of folders) rmSync(f, { recursive: true, force: true });
});

/** The migrations folder as it stood before 0015: the journal cut after 0014. */
function before0015(): string {
	const dir = mkdtempSync(join(tmpdir(), 'benchcall-0014-'));
	folders.push(dir);
	cpSync('drizzle', dir, { recursive: true });
	const file = join(dir, 'meta', '_journal.json');
	const journal = JSON.parse(readFileSync(file, 'utf8'));
	journal.entries = journal.entries.filter((e: { idx: number }) => e.idx < 15);
	writeFileSync(file, JSON.stringify(journal));
	return dir;
}

/** A shop with one job of one step, written with 0014's schema. */
async function oldShop(sql: Sql, name: string) {
	const [shop] = await sql`insert into shop (name) values (${name}) returning id`;
	const [tech] = await sql`insert into "user" (shop_id, email, name, role, password_hash)
		values (${shop.id}, ${name + '@test.test'}, 'Tech', 'technician', 'x') returning id`;
	const [job] = await sql`insert into job (shop_id, number, technician_id, state)
		values (${shop.id}, 1, ${tech.id}, 'in_work') returning id`;
	const [jp] = await sql`insert into job_procedure (shop_id, job_id, name, position)
		values (${shop.id}, ${job.id}, 'Service', 1) returning id`;
	const [step] =
		await sql`insert into job_step (shop_id, job_id, job_procedure_id, position, label, unit, nominal, min, max)
		values (${shop.id}, ${job.id}, ${jp.id}, 1, 'rear axle', 'N.m', 88, 80, 96) returning id`;
	return { shop: shop.id as string, tech: tech.id as string, job: job.id as string, step: step.id };
}

async function logOne(sql: Sql, s: Awaited<ReturnType<typeof oldShop>>, value: number) {
	const [row] = await sql`
		insert into log_entry (id, shop_id, job_id, job_step_id, author_id, kind, raw_text, source,
			value, unit, spec_value, spec_unit, verdict, occurred_at)
		values (gen_random_uuid(), ${s.shop}, ${s.job}, ${s.step}, ${s.tech}, 'measure',
			${'rear axle ' + value + ' Nm'}, 'typed', ${value}, 'N.m', ${value}, 'N.m',
			${value < 80 ? 'low' : value > 96 ? 'high' : 'in'}, now())
		returning id, seq`;
	return row as { id: string; seq: string };
}

describe('migration 0015 (shop keys)', () => {
	it('keeps the chains whole and continues each shop’s seq from its highest', async () => {
		await withScratchDatabase(async (sql) => {
			await migrate(drizzle(sql), { migrationsFolder: before0015() });
			const a = await oldShop(sql, 'Shop A');
			const b = await oldShop(sql, 'Shop B');
			// Interleaved under the global seq: A 1, B 2, A 3, …
			for (let i = 0; i < 6; i++) await logOne(sql, i % 2 ? b : a, 70 + i * 5);
			const [retracted] = await sql`select id from log_entry where shop_id = ${a.shop} limit 1`;
			await sql`insert into log_entry (id, shop_id, job_id, job_step_id, author_id, kind, raw_text,
				source, retracts, occurred_at)
				values (gen_random_uuid(), ${a.shop}, ${a.job}, ${a.step}, ${a.tech}, 'retraction', 'undo',
					'typed', ${retracted.id}, now())`;
			const [{ top }] =
				await sql`select max(seq)::int as top from log_entry where shop_id = ${a.shop}`;

			await migrate(drizzle(sql), { migrationsFolder: 'drizzle' });

			const report = await verifyChains(sql);
			expect(report.entries).toBe(7);
			expect(report.breaks).toEqual([]);
			const nextA = await logOne(sql, a, 88);
			expect(Number(nextA.seq)).toBe(top + 1);
			// Shop B's sequence is its own: A's new entry did not move it.
			const [{ top_b: topB }] =
				await sql`select max(seq)::int as top_b from log_entry where shop_id = ${b.shop}`;
			expect(Number((await logOne(sql, b, 88)).seq)).toBe(topB + 1);
			// The derived state still follows the log after the new keys.
			const [state] = await sql`select latest_measure_id, waiting from job_step_state
				where shop_id = ${a.shop} and job_step_id = ${a.step}`;
			expect(state).toEqual({ latest_measure_id: nextA.id, waiting: false });
			expect((await verifyChains(sql)).breaks).toEqual([]);
			// A shop made after the migration gets its own sequence from 1.
			const c = await oldShop(sql, 'Shop C');
			expect(Number((await logOne(sql, c, 88)).seq)).toBe(1);
		});
	});

	it('refuses, naming the rows, when a child row points at another shop’s parent', async () => {
		await withScratchDatabase(async (sql) => {
			await migrate(drizzle(sql), { migrationsFolder: before0015() });
			const a = await oldShop(sql, 'Shop A');
			const b = await oldShop(sql, 'Shop B');
			// Possible before 0015: the foreign key named the job's id only.
			await sql`insert into job_state_change (shop_id, job_id, to_state)
				values (${b.shop}, ${a.job}, 'in_work')`;
			const failed = await migrate(drizzle(sql), { migrationsFolder: 'drizzle' }).then(
				() => null,
				(err: Error) => err
			);
			// drizzle wraps the database's error: its words are the cause's.
			expect(String((failed?.cause as Error | undefined)?.message)).toMatch(
				/job_state_change\.job_id: 1 rows name a job of another shop \(e\.g\. [0-9a-f-]{36}\)/
			);
			// Nothing of 0015 was applied: the old primary key is still there.
			const [pk] = await sql`select conname from pg_constraint
				where conrelid = 'log_entry'::regclass and contype = 'p'`;
			expect(pk.conname).toBe('log_entry_pkey');
		});
	});
});
