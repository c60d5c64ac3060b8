// npm run photos:thumbs: makes the downscaled copy and the SHA-256 of every stored photo that has
// none recorded, at once on every core. The app does the same in the background at start, one
// photo at a time (thumbs-backfill.ts), so this is for an operator who wants it done now, or to
// try again photos the app gave up on (it tries each a few times; this tries every one). Safe to
// run again: photos whose row records a copy are skipped. Photos are shrunk a few at a time
// (SHRINK_POOL), so memory stays bounded.
// DATABASE_URL and BENCHCALL_UPLOADS_DIR, or the project's own database and uploads folder;
// `--shop <uuid>` for one shop only.
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import postgres from 'postgres';
import { config, databaseUrl } from './lib/config.js';
import { localDiskStorage } from '../src/lib/server/storage-disk';
import { SHRINK_POOL } from '../src/lib/server/thumbs';
import { backfillCopies } from '../src/lib/server/thumbs-backfill';

const { values } = parseArgs({ options: { shop: { type: 'string' } } });
if (values.shop && !/^[0-9a-f-]{36}$/.test(values.shop)) {
	console.error(`--shop takes a shop's id (a UUID), not “${values.shop}”.`);
	process.exit(2);
}
const sql = postgres(process.env.DATABASE_URL ?? databaseUrl(), { max: 2, onnotice: () => {} });
const storage = localDiskStorage(config.uploadsDir);
const t0 = performance.now();
try {
	const n = await backfillCopies(sql, storage, {
		pool: SHRINK_POOL,
		maxTries: null,
		shopId: values.shop,
		progress: (c) => process.stdout.write(`\r${c.photos} photos looked at…`)
	});
	const s = ((performance.now() - t0) / 1000).toFixed(1);
	console.log(
		`\r${n.photos} photos without a recorded copy in ${s} s: ${n.made} copies made, ` +
			`${n.kept} found and recorded, ${n.missing} files missing, ${n.unreadable} that cannot be ` +
			`read (packs show a line instead).`
	);
	for (const line of n.problems) console.log(`  ${line}`);
} catch (err) {
	console.error(`Could not make the copies: ${err instanceof Error ? err.message : String(err)}`);
	process.exitCode = 2;
} finally {
	await sql.end({ timeout: 2 });
}
