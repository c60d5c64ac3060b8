import { drizzle } from 'drizzle-orm/postgres-js';
import { migrate } from 'drizzle-orm/postgres-js/migrator';
import postgres from 'postgres';
import { describe, expect, it } from 'vitest';

const url = process.env.DATABASE_URL!;

describe('migrations', () => {
	it('apply to an empty database and create every table of the model', async () => {
		const admin = postgres(url, { max: 1, onnotice: () => {} });
		const name = `benchcall_scratch_${process.pid}_${Date.now()}`;
		await admin.unsafe(`create database ${name}`);
		const scratchUrl = new URL(url);
		scratchUrl.pathname = `/${name}`;
		const scratch = postgres(scratchUrl.toString(), { max: 1, onnotice: () => {} });
		try {
			await migrate(drizzle(scratch), { migrationsFolder: 'drizzle' });
			const tables = await scratch<{ table_name: string }[]>`
				select table_name from information_schema.tables where table_schema = 'public' order by 1`;
			expect(tables.map((t) => t.table_name)).toEqual(
				expect.arrayContaining([
					'shop',
					'user',
					'session',
					'customer',
					'vehicle',
					'procedure',
					'procedure_step',
					'job',
					'job_step',
					'log_entry',
					'part',
					'torque_tool'
				])
			);
			const triggers = await scratch`
				select trigger_name from information_schema.triggers where event_object_table = 'log_entry'`;
			expect(triggers.map((t) => t.trigger_name)).toContain('log_entry_no_update_delete');
			// Applying again is a no-op, as a second `npm start` needs.
			await migrate(drizzle(scratch), { migrationsFolder: 'drizzle' });
		} finally {
			await scratch.end();
			await admin.unsafe(`drop database if exists ${name} with (force)`);
			await admin.end();
		}
	});
});
