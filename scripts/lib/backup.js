// Backups of the private cluster's databases with pg_dump / pg_restore from the same
// PostgreSQL installation. Built-ins only.
import { existsSync, mkdirSync, statSync } from 'node:fs';
import { basename, join, resolve } from 'node:path';
import { config, databaseUrl } from './config.js';
import { ensureDatabase, psqlAdmin, startCluster } from './pg.js';
import { run, step } from './run.js';

const backupsDir = join(config.dataDir, 'backups');

function stamp(date = new Date()) {
	return date.toISOString().replace(/[-:]/g, '').replace('T', '-').slice(0, 15);
}

/** pg_dump (custom format) of one database into .data/backups; returns the file's path. */
export async function backup(dbName = config.dbName, outDir = backupsDir) {
	const bin = await startCluster();
	mkdirSync(outDir, { recursive: true });
	const file = join(outDir, `${dbName}-${stamp()}.dump`);
	const code = await run(join(bin, 'pg_dump'), [
		'--format=custom',
		'--no-owner',
		`--file=${file}`,
		`--dbname=${databaseUrl(dbName)}`
	]);
	if (code !== 0) throw new Error(`pg_dump of ${dbName} failed (exit ${code}).`);
	console.log(`  Backup written: ${file} (${(statSync(file).size / 1024).toFixed(0)} kB)`);
	return file;
}

/**
 * Restores a dump into `dbName`, which is dropped and made anew. Restoring over the main
 * database first takes a safety backup of it, so a wrong file loses nothing.
 */
export async function restore(file, dbName = config.dbName) {
	const path = resolve(file);
	if (!existsSync(path)) throw new Error(`No backup file at ${path}.`);
	const bin = await startCluster();
	const exists =
		psqlAdmin(
			bin,
			`SELECT 1 FROM pg_database WHERE datname = '${dbName.replaceAll("'", "''")}'`
		) === '1';
	if (exists) {
		step(`Safety backup of ${dbName} before restoring over it`);
		await backup(dbName);
	}
	step(`Restoring ${basename(path)} into ${dbName}`);
	ensureDatabase(bin, dbName, { fresh: true });
	const code = await run(join(bin, 'pg_restore'), [
		'--no-owner',
		'--exit-on-error',
		`--dbname=${databaseUrl(dbName)}`,
		path
	]);
	if (code !== 0) throw new Error(`pg_restore into ${dbName} failed (exit ${code}).`);
	console.log(`  Restored into ${dbName}.`);
}
