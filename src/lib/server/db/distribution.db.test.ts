// Ready for a PostgreSQL-compatible engine that distributes tables by a key: the shop is that
// key. The schema's unique indexes and foreign keys are read from pg_catalog
// (scripts/lib/distribution-audit.js, also `npm run db:audit-distribution`), so a new table or
// key is checked without being listed here; reference data is named there, each with a reason.
import postgres from 'postgres';
import { afterAll, describe, expect, it } from 'vitest';
import { obstacles, REFERENCE_TABLES } from '../../../../scripts/lib/distribution-audit.js';

const sql = postgres(process.env.DATABASE_URL!, { max: 1, onnotice: () => {} });
afterAll(() => sql.end());

/** Thrown to roll a probe's transaction back. */
class Undo extends Error {}

/** The obstacles with `ddl` applied, then rolled back. */
async function obstaclesWith(ddl: string): Promise<string[]> {
	let found: string[] = [];
	await sql
		.begin(async (tx) => {
			await tx.unsafe(ddl);
			found = await obstacles(tx);
			throw new Undo();
		})
		.catch((err) => {
			if (!(err instanceof Undo)) throw err;
		});
	return found;
}

describe('distribution by shop', () => {
	it('finds nothing that would stop the shop tables being distributed by shop_id', async () => {
		expect(await obstacles(sql)).toEqual([]);
	});

	it('gives every reference table its reason', () => {
		expect(Object.keys(REFERENCE_TABLES).sort()).toEqual([
			'session',
			'shop',
			'sign_in_failure',
			'user'
		]);
		for (const why of Object.values(REFERENCE_TABLES)) expect(why.length).toBeGreaterThan(20);
	});

	it('names a shop table whose unique key or foreign key lacks shop_id', async () => {
		const found = await obstaclesWith(`
			create table probe_parent (shop_id uuid not null, id uuid primary key, code text unique);
			create table probe_child (shop_id uuid not null, id uuid not null, parent_id uuid
				references probe_parent (id), primary key (shop_id, id));
			create table probe_orphan (id uuid primary key)`);
		expect(found).toEqual([
			'table probe_orphan has no shop_id and is not named as reference data',
			'unique index probe_orphan_pkey on probe_orphan (id) lacks shop_id',
			'unique index probe_parent_code_key on probe_parent (code) lacks shop_id',
			'unique index probe_parent_pkey on probe_parent (id) lacks shop_id',
			'foreign key probe_child_parent_id_fkey: probe_child (parent_id) → probe_parent (id) does not match shop_id'
		]);
	});

	it('names reference data that points at a shop table', async () => {
		const found = await obstaclesWith(
			`alter table sign_in_failure add column job_id uuid, add column shop_id uuid,
				add foreign key (shop_id, job_id) references job (shop_id, id)`
		);
		expect(found).toHaveLength(1);
		expect(found[0]).toMatch(/sign_in_failure .* → job .*reference data points at a shop table/);
	});
});
