// npm run photos:thumbs: makes the downscaled copy of every stored photo that has none (photos
// stored before copies were made at upload, or whose copy failed), so that no evidence pack has to
// shrink hundreds of full-size photos while someone waits for it. Safe to run again: photos with a
// copy are skipped. Photos are shrunk a few at a time (SHRINK_POOL), so memory stays bounded.
// DATABASE_URL and BENCHCALL_UPLOADS_DIR, or the project's own database and uploads folder;
// `--shop <uuid>` for one shop only.
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import postgres from 'postgres';
import { config, databaseUrl } from './lib/config.js';
import { localDiskStorage } from '../src/lib/server/storage-disk';
import { SHRINK_POOL, smallPhotos } from '../src/lib/server/thumbs';

const { values } = parseArgs({ options: { shop: { type: 'string' } } });
if (values.shop && !/^[0-9a-f-]{36}$/.test(values.shop)) {
	console.error(`--shop takes a shop's id (a UUID), not “${values.shop}”.`);
	process.exit(2);
}
const sql = postgres(process.env.DATABASE_URL ?? databaseUrl(), { max: 2, onnotice: () => {} });
const storage = localDiskStorage(config.uploadsDir);
const count = { photos: 0, kept: 0, made: 0, missing: 0, unreadable: 0 };
const unreadable: string[] = [];
const t0 = performance.now();
try {
	const rows = sql<{ storage_key: string; file_name: string }[]>`
		select storage_key, file_name from attachment
		where ${values.shop ? sql`shop_id = ${values.shop}` : sql`true`}
		order by created_at, id`.cursor(200);
	for await (const batch of rows) {
		const keys = batch.map((r) => r.storage_key);
		let i = 0;
		for await (const photo of smallPhotos(storage, keys, SHRINK_POOL)) {
			const row = batch[i++];
			count.photos++;
			if (photo.ok) count[photo.made ? 'made' : 'kept']++;
			else {
				count[photo.reason]++;
				if (unreadable.length < 20)
					unreadable.push(`${photo.reason}: ${row.storage_key} (${row.file_name})`);
			}
		}
		process.stdout.write(`\r${count.photos} photos looked at…`);
	}
	const s = ((performance.now() - t0) / 1000).toFixed(1);
	console.log(
		`\r${count.photos} photos in ${s} s: ${count.made} copies made, ${count.kept} had one, ` +
			`${count.missing} files missing, ${count.unreadable} that cannot be read (packs show a line instead).`
	);
	for (const line of unreadable) console.log(`  ${line}`);
} catch (err) {
	console.error(`Could not make the copies: ${err instanceof Error ? err.message : String(err)}`);
	process.exitCode = 2;
} finally {
	await sql.end({ timeout: 2 });
}
