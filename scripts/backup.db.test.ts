import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import postgres from 'postgres';
import { describe, expect, it } from 'vitest';
import { findPgBin, psqlAdmin } from './lib/pg.js';

const url = new URL(process.env.DATABASE_URL!);
const source = url.pathname.slice(1);

function db(args: string[]) {
	const r = spawnSync(process.execPath, ['scripts/db.js', ...args], { encoding: 'utf8' });
	if (r.status !== 0) throw new Error(`db.js ${args.join(' ')} failed:\n${r.stdout}\n${r.stderr}`);
	return r.stdout;
}

async function snapshot(dbUrl: string) {
	const sql = postgres(dbUrl, { max: 1, onnotice: () => {} });
	try {
		const tables = await sql<{ name: string }[]>`
			select table_name as name from information_schema.tables
			where table_schema = 'public' and table_type = 'BASE TABLE' order by 1`;
		const counts: Record<string, number> = {};
		for (const { name } of tables) {
			const [row] = await sql.unsafe(`select count(*)::int as n from "${name}"`);
			counts[name] = row.n;
		}
		const newest =
			await sql`select id, seq, raw_text, verdict from log_entry order by seq desc limit 5`;
		return { counts, newest: newest.map((r) => ({ ...r })) };
	} finally {
		await sql.end();
	}
}

describe('db:backup and db:restore', () => {
	it('restore a backup into a scratch database with the same rows and newest entries', async () => {
		const out = mkdtempSync(join(tmpdir(), 'benchcall-backup-'));
		db(['backup', '--db', source, '--out', out]);
		const files = readdirSync(out).filter((f) => f.endsWith('.dump'));
		expect(files).toHaveLength(1);

		const scratch = `benchcall_restore_${process.pid}`;
		db(['restore', join(out, files[0]), '--into', scratch]);

		const scratchUrl = new URL(url);
		scratchUrl.pathname = `/${scratch}`;
		const before = await snapshot(url.toString());
		const after = await snapshot(scratchUrl.toString());
		expect(Object.keys(after.counts).length).toBeGreaterThan(10);
		expect(after.counts).toEqual(before.counts);
		expect(after.counts.log_entry).toBeGreaterThan(0);
		expect(after.newest).toEqual(before.newest);

		// The append-only trigger comes back with the data.
		const sql = postgres(scratchUrl.toString(), { max: 1, onnotice: () => {} });
		try {
			await expect(sql`delete from log_entry`).rejects.toThrow(/append-only/);
		} finally {
			await sql.end();
			// As the cluster's superuser: right after a restore an autovacuum worker (a superuser
			// process the app's role may not end) can be connected to the scratch database.
			expect(
				psqlAdmin(findPgBin(), `drop database if exists ${scratch} with (force)`)
			).not.toBeNull();
		}
	});

	it('refuses a missing file with a clear message', () => {
		const r = spawnSync(
			process.execPath,
			['scripts/db.js', 'restore', '/nonexistent/x.dump', '--into', 'benchcall_never'],
			{
				encoding: 'utf8'
			}
		);
		expect(r.status).toBe(1);
		expect(r.stderr).toMatch(/No backup file at/);
	});
});
