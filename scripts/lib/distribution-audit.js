// What stops the schema from being distributed by shop on a PostgreSQL-compatible engine that
// shards tables by one column: read from pg_catalog, so a new table or index is checked without
// being listed. Such an engine enforces a unique key or a foreign key only when it holds the
// distribution column: every unique index of a shop table (the primary key too) must include
// shop_id, and every foreign key between shop tables must match shop_id to shop_id. Reference
// data is kept whole on every node instead; a key from a shop table to it needs no shop_id.
import postgres from 'postgres';

/** Reference data, each with the reason it is not distributed by shop. */
export const REFERENCE_TABLES = {
	shop: 'the distribution key itself: shop.id is every other table’s shop_id',
	user: 'the sign-in name (e-mail) is unique across Benchcall and found before the shop is known',
	session: 'lucia looks a session up by its id alone, on every request, before the shop is known',
	sign_in_failure: 'throttles sign-in by e-mail and address, before any shop is known'
};

const isReference = (/** @type {string} */ t) => Object.hasOwn(REFERENCE_TABLES, t);

/**
 * @param {import('postgres').Sql | import('postgres').TransactionSql} client
 * @returns {Promise<string[]>} one line per obstacle
 */
export async function obstacles(client) {
	const tables = await client`
		select c.relname as name,
			exists (select 1 from pg_attribute a where a.attrelid = c.oid and a.attname = 'shop_id'
				and not a.attisdropped) as has_shop
		from pg_class c
		join pg_namespace n on n.oid = c.relnamespace and n.nspname = 'public'
		where c.relkind in ('r', 'p') order by 1`;
	const uniques = await client`
		select t.relname as table_name, i.relname as index_name,
			array(select coalesce(a.attname, '(expression)')
				from unnest(x.indkey[0:x.indnkeyatts - 1]) k(attnum)
				left join pg_attribute a on a.attrelid = t.oid and a.attnum = k.attnum) as columns
		from pg_index x
		join pg_class i on i.oid = x.indexrelid
		join pg_class t on t.oid = x.indrelid
		join pg_namespace n on n.oid = t.relnamespace and n.nspname = 'public'
		where x.indisunique order by 1, 2`;
	const fks = await client`
		select c.conname, t.relname as table_name, f.relname as ref_table,
			array(select a.attname from unnest(c.conkey) with ordinality k(attnum, n)
				join pg_attribute a on a.attrelid = c.conrelid and a.attnum = k.attnum order by k.n)
				as columns,
			array(select a.attname from unnest(c.confkey) with ordinality k(attnum, n)
				join pg_attribute a on a.attrelid = c.confrelid and a.attnum = k.attnum order by k.n)
				as ref_columns
		from pg_constraint c
		join pg_class t on t.oid = c.conrelid
		join pg_class f on f.oid = c.confrelid
		join pg_namespace n on n.oid = t.relnamespace and n.nspname = 'public'
		where c.contype = 'f' order by 2, 1`;
	const out = [];
	const names = new Set(tables.map((t) => t.name));
	for (const t of Object.keys(REFERENCE_TABLES)) {
		if (!names.has(t)) out.push(`reference table ${t} no longer exists: drop its exemption`);
	}
	for (const t of tables) {
		if (!t.has_shop && !isReference(t.name)) {
			out.push(`table ${t.name} has no shop_id and is not named as reference data`);
		}
	}
	for (const u of uniques) {
		if (!isReference(u.table_name) && !u.columns.includes('shop_id')) {
			out.push(
				`unique index ${u.index_name} on ${u.table_name} (${u.columns.join(', ')}) lacks shop_id`
			);
		}
	}
	for (const f of fks) {
		const from = `foreign key ${f.conname}: ${f.table_name} (${f.columns.join(', ')}) → ${f.ref_table} (${f.ref_columns.join(', ')})`;
		if (isReference(f.table_name)) {
			// Reference data is copied to every node, where a shop's rows may not be.
			if (!isReference(f.ref_table)) out.push(`${from}: reference data points at a shop table`);
		} else if (!isReference(f.ref_table)) {
			const at = f.columns.indexOf('shop_id');
			if (at < 0 || f.ref_columns[at] !== 'shop_id') out.push(`${from} does not match shop_id`);
		}
	}
	return out;
}

/** @param {string} url @returns {Promise<string[]>} one line per obstacle */
export async function distributionObstacles(url) {
	const client = postgres(url, { max: 1, onnotice: () => {} });
	try {
		return await obstacles(client);
	} finally {
		await client.end();
	}
}
