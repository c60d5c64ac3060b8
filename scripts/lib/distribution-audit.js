// What stops the schema from being distributed by shop on a PostgreSQL-compatible engine that
// shards tables by one column: read from pg_catalog. A shop table (one with a shop_id column)
// may be distributed by shop_id only if every unique index (the primary key too) includes
// shop_id, and every foreign key to another shop table carries shop_id on both sides.
import postgres from 'postgres';

/** @param {string} url @returns {Promise<string[]>} one line per obstacle */
export async function distributionObstacles(url) {
	const client = postgres(url, { max: 1, onnotice: () => {} });
	try {
		const shopTables = (
			await client`
				select c.relname from pg_class c
				join pg_namespace n on n.oid = c.relnamespace and n.nspname = 'public'
				join pg_attribute a on a.attrelid = c.oid and a.attname = 'shop_id' and not a.attisdropped
				where c.relkind = 'r' order by 1`
		).map((r) => r.relname);
		const uniques = await client`
			select t.relname as table_name, i.relname as index_name,
				array(select a.attname from unnest(x.indkey) k
					join pg_attribute a on a.attrelid = x.indrelid and a.attnum = k) as columns
			from pg_index x
			join pg_class t on t.oid = x.indrelid
			join pg_class i on i.oid = x.indexrelid
			join pg_namespace n on n.oid = t.relnamespace and n.nspname = 'public'
			where x.indisunique and t.relname = any(${shopTables})
			order by 1, 2`;
		const fks = await client`
			select f.conname, t.relname as table_name, r.relname as ref_table,
				array(select a.attname from unnest(f.conkey) k
					join pg_attribute a on a.attrelid = f.conrelid and a.attnum = k) as columns,
				array(select a.attname from unnest(f.confkey) k
					join pg_attribute a on a.attrelid = f.confrelid and a.attnum = k) as ref_columns
			from pg_constraint f
			join pg_class t on t.oid = f.conrelid
			join pg_class r on r.oid = f.confrelid
			join pg_namespace n on n.oid = t.relnamespace and n.nspname = 'public'
			where f.contype = 'f' and t.relname = any(${shopTables}) and r.relname = any(${shopTables})
			order by 2, 1`;
		const out = [];
		for (const u of uniques) {
			if (!u.columns.includes('shop_id')) {
				out.push(
					`unique index ${u.index_name} on ${u.table_name} (${u.columns.join(', ')}) lacks shop_id`
				);
			}
		}
		for (const f of fks) {
			if (!f.columns.includes('shop_id') || !f.ref_columns.includes('shop_id')) {
				out.push(
					`foreign key ${f.conname}: ${f.table_name} (${f.columns.join(', ')}) → ${f.ref_table} (${f.ref_columns.join(', ')}) does not carry shop_id`
				);
			}
		}
		return out;
	} finally {
		await client.end();
	}
}
