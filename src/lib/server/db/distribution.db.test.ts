// Ready for a PostgreSQL-compatible engine that distributes tables by a key: the shop is that
// key. Such an engine can enforce a unique key or a foreign key only when it holds the
// distribution column, so every unique index of a shop's table must include shop_id, and every
// foreign key between shop tables must match shop_id to shop_id. Read from pg_catalog, so a
// new table or index is checked without being listed here.
import postgres from 'postgres';
import { afterAll, describe, expect, it } from 'vitest';

const sql = postgres(process.env.DATABASE_URL!, { max: 1, onnotice: () => {} });
afterAll(() => sql.end());

/**
 * Reference data: small tables kept whole on every node of a distributed engine. A foreign key
 * from a shop table to one of these needs no shop_id.
 */
const REFERENCE: Record<string, string> = {
	shop: 'the distribution key itself: shop.id is every other table’s shop_id',
	user: 'the sign-in name (e-mail) is unique across Benchcall and found before the shop is known',
	session: 'lucia looks a session up by its id alone, on every request, before the shop is known',
	sign_in_failure: 'throttles sign-in by e-mail and address, before any shop is known'
};

interface Key {
	table: string;
	name: string;
	columns: string[];
}
interface Foreign extends Key {
	target: string;
	targetColumns: string[];
}

async function tables(): Promise<Map<string, string[]>> {
	const rows = await sql<{ table: string; column: string }[]>`
		select c.relname as table, a.attname as column
		from pg_class c
		join pg_namespace n on n.oid = c.relnamespace and n.nspname = 'public'
		join pg_attribute a on a.attrelid = c.oid and a.attnum > 0 and not a.attisdropped
		where c.relkind in ('r', 'p')`;
	const out = new Map<string, string[]>();
	for (const r of rows) out.set(r.table, [...(out.get(r.table) ?? []), r.column]);
	return out;
}

/** Every unique index (primary keys included) of the public schema, with its key columns. */
async function uniqueKeys(): Promise<Key[]> {
	return sql<Key[]>`
		select t.relname as table, i.relname as name,
			array(select coalesce(a.attname, '(expression)')
				from unnest(x.indkey[0:x.indnkeyatts - 1]) k(attnum)
				left join pg_attribute a on a.attrelid = t.oid and a.attnum = k.attnum) as columns
		from pg_index x
		join pg_class i on i.oid = x.indexrelid
		join pg_class t on t.oid = x.indrelid
		join pg_namespace n on n.oid = t.relnamespace and n.nspname = 'public'
		where x.indisunique
		order by 1, 2`;
}

/** Every foreign key of the public schema, with the columns on both sides in order. */
async function foreignKeys(): Promise<Foreign[]> {
	return sql<Foreign[]>`
		select t.relname as table, c.conname as name, f.relname as target,
			array(select a.attname from unnest(c.conkey) with ordinality k(attnum, n)
				join pg_attribute a on a.attrelid = c.conrelid and a.attnum = k.attnum order by k.n)
				as columns,
			array(select a.attname from unnest(c.confkey) with ordinality k(attnum, n)
				join pg_attribute a on a.attrelid = c.confrelid and a.attnum = k.attnum order by k.n)
				as "targetColumns"
		from pg_constraint c
		join pg_class t on t.oid = c.conrelid
		join pg_class f on f.oid = c.confrelid
		join pg_namespace n on n.oid = t.relnamespace and n.nspname = 'public'
		where c.contype = 'f'
		order by 1, 2`;
}

describe('distribution by shop', () => {
	it('every table is a shop table with shop_id or named reference data', async () => {
		const all = await tables();
		expect(all.size).toBeGreaterThan(20);
		const neither = [...all]
			.filter(([name, columns]) => !(name in REFERENCE) && !columns.includes('shop_id'))
			.map(([name]) => name);
		expect(neither).toEqual([]);
		// A reference table that no longer exists is a stale exemption.
		expect(Object.keys(REFERENCE).filter((t) => !all.has(t))).toEqual([]);
	});

	it("every unique key of a shop's table includes shop_id, the primary key too", async () => {
		const keys = await uniqueKeys();
		expect(keys.some((k) => k.table === 'log_entry')).toBe(true);
		const bad = keys
			.filter((k) => !(k.table in REFERENCE) && !k.columns.includes('shop_id'))
			.map((k) => `${k.table}.${k.name} (${k.columns.join(', ')})`);
		expect(bad).toEqual([]);
	});

	it('every foreign key between shop tables matches shop_id to shop_id', async () => {
		const keys = await foreignKeys();
		expect(keys.some((k) => k.table === 'log_entry' && k.target === 'job')).toBe(true);
		const bad = keys
			.filter((k) => !(k.table in REFERENCE) && !(k.target in REFERENCE))
			.filter((k) => {
				const at = k.columns.indexOf('shop_id');
				return at < 0 || k.targetColumns[at] !== 'shop_id';
			})
			.map((k) => `${k.table}.${k.name} (${k.columns.join(', ')}) → ${k.target}`);
		expect(bad).toEqual([]);
	});

	it('no reference table points at a shop table', async () => {
		// A distributed engine copies reference data to every node, where the shop's rows may
		// not be: a key from user to shop is the one allowed, shop being reference data too.
		const keys = await foreignKeys();
		const bad = keys
			.filter((k) => k.table in REFERENCE && !(k.target in REFERENCE))
			.map((k) => `${k.table}.${k.name} → ${k.target}`);
		expect(bad).toEqual([]);
	});
});
