// The shared bootstrap of `npm start`, `npm run dev` and `npm test`:
// packages, PostgreSQL, database, migrations, demo data.
import { existsSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { config, databaseUrl, root } from './config.js';
import { ensureDatabase, startCluster } from './pg.js';
import { must, step } from './run.js';

/** `npm ci` when node_modules is missing or older than the lock file. */
export async function ensurePackages() {
	const marker = join(root, 'node_modules', '.package-lock.json');
	const lock = join(root, 'package-lock.json');
	if (existsSync(marker) && statSync(marker).mtimeMs >= statSync(lock).mtimeMs) return;
	step('Installing npm packages (npm ci)');
	await must('npm', ['ci', '--no-audit', '--no-fund']);
}

/**
 * Starts the cluster and makes one database ready: role, database, migrations, and the
 * demo shop when the database is empty. Returns its URL.
 */
export async function prepareDatabase(dbName, { fresh = false } = {}) {
	const bin = await startCluster();
	ensureDatabase(bin, dbName, { fresh });
	const url = databaseUrl(dbName);
	const { applyMigrations, isEmpty } = await import('./migrate.js');
	step(`Migrating database ${dbName}`);
	await applyMigrations(url);
	if (await isEmpty(url)) {
		step(`Seeding the demo shop into ${dbName}`);
		await seed(url);
	}
	return url;
}

export async function seed(url) {
	await must(process.execPath, ['--import', 'tsx', join('scripts', 'seed.ts')], {
		env: { ...process.env, DATABASE_URL: url }
	});
}

export { config };
