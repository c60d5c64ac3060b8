// Applies the committed Drizzle migrations in drizzle/ to one database.
import { drizzle } from 'drizzle-orm/postgres-js';
import { migrate } from 'drizzle-orm/postgres-js/migrator';
import { join } from 'node:path';
import postgres from 'postgres';
import { root } from './config.js';

/** @param {string} url */
export async function applyMigrations(url) {
	const client = postgres(url, { max: 1, onnotice: () => {} });
	try {
		await migrate(drizzle(client), { migrationsFolder: join(root, 'drizzle') });
	} finally {
		await client.end();
	}
}

/** True when the database holds no shop yet. @param {string} url */
export async function isEmpty(url) {
	const client = postgres(url, { max: 1, onnotice: () => {} });
	try {
		const [row] = await client`SELECT count(*)::int AS n FROM shop`;
		return row.n === 0;
	} finally {
		await client.end();
	}
}
