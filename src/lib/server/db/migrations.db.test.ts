import { getTableConfig, PgTable } from 'drizzle-orm/pg-core';
import { drizzle } from 'drizzle-orm/postgres-js';
import { migrate } from 'drizzle-orm/postgres-js/migrator';
import { describe, expect, it } from 'vitest';
import { withScratchDatabase } from './fixtures';
import * as schema from './schema';

/** Every table the model declares, with its columns: read from schema.ts, not listed here. */
const model = Object.values(schema)
	.filter((t) => t instanceof PgTable)
	.map((t) => {
		const c = getTableConfig(t as PgTable);
		return { name: c.name, columns: c.columns.map((col) => col.name).sort() };
	})
	.sort((a, b) => a.name.localeCompare(b.name));

describe('migrations', () => {
	it('apply to an empty database and create every table and column of the model', async () => {
		expect(model.length).toBeGreaterThan(20);
		await withScratchDatabase(async (scratch) => {
			await migrate(drizzle(scratch), { migrationsFolder: 'drizzle' });
			const rows = await scratch<{ table_name: string; column_name: string }[]>`
				select table_name, column_name from information_schema.columns
				where table_schema = 'public' order by 1, 2`;
			const made = new Map<string, string[]>();
			for (const r of rows)
				made.set(r.table_name, [...(made.get(r.table_name) ?? []), r.column_name]);
			const fromMigrations = model.map((t) => ({
				name: t.name,
				columns: (made.get(t.name) ?? []).sort()
			}));
			expect(fromMigrations).toEqual(model);
			const triggers = await scratch`
				select trigger_name from information_schema.triggers where event_object_table = 'log_entry'`;
			expect(triggers.map((t) => t.trigger_name)).toContain('log_entry_no_update_delete');
			// Applying again is a no-op, as a second `npm start` needs.
			await migrate(drizzle(scratch), { migrationsFolder: 'drizzle' });
		});
	});
});
