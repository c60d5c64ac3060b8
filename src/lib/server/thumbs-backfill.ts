// Makes the downscaled copy and the SHA-256 of every photo that has none recorded: photos stored
// before copies were recorded, copies that failed at upload, and photos an evidence pack left for
// later. The app runs it in the background at start and after such a miss (photos.ts: one photo at
// a time, resting between photos, so the Bench and the Floor keep their speed); `npm run
// photos:thumbs` runs it at once on every core. Safe to run twice: a photo's row says what is done.
// Relative imports only (scripts).
import { performance } from 'node:perf_hooks';
import type { Sql } from 'postgres';
import type { FileStorage } from './storage-disk';
import { hashMissing, lookAndRecord, MAX_COPY_TRIES, type PhotoCopyRow } from './thumbs';

export interface BackfillCount {
	photos: number;
	made: number;
	/** had a copy in storage (made before copies were recorded): recorded now */
	kept: number;
	missing: number;
	unreadable: number;
	/** up to 20 `reason: key` lines for the photos that could not be copied */
	problems: string[];
}

export interface BackfillOptions {
	/** Photos worked on at once. */
	pool?: number;
	/** Rest this many times the time the last photos took (0: none): 3 keeps to ¼ of a core. */
	rest?: number;
	/** Leave photos that failed this many times (null: try every photo again). */
	maxTries?: number | null;
	shopId?: string;
	signal?: AbortSignal;
	/** Called after each batch, with the counts so far. */
	progress?: (count: BackfillCount) => void;
}

const BATCH = 100;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms).unref());

/** One pass over the photos without a recorded copy or hash (in id order). */
export async function backfillCopies(
	sql: Sql,
	storage: FileStorage,
	opts: BackfillOptions = {}
): Promise<BackfillCount> {
	const pool = Math.max(1, opts.pool ?? 1);
	const maxTries = opts.maxTries === undefined ? MAX_COPY_TRIES : opts.maxTries;
	const count: BackfillCount = {
		photos: 0,
		made: 0,
		kept: 0,
		missing: 0,
		unreadable: 0,
		problems: []
	};
	const where = (after: string | null) => sql`
		${maxTries === null ? sql`true` : sql`thumb_tries < ${maxTries}`}
		${opts.shopId ? sql`and shop_id = ${opts.shopId}` : sql``}
		${after ? sql`and id > ${after}` : sql``}`;
	// Hashes first: a few ms a photo, and a pack past its time can print them without reading.
	let after: string | null = null;
	for (;;) {
		if (opts.signal?.aborted) break;
		const rows: PhotoCopyRow[] = await sql`
			select id, storage_key as "storageKey", thumb_key as "thumbKey", sha256
			from attachment where sha256 is null and ${where(after)} order by id limit ${BATCH}`;
		if (rows.length === 0) break;
		const t0 = performance.now();
		await hashMissing(sql, storage, rows);
		if (opts.rest) await sleep((performance.now() - t0) * opts.rest);
		after = rows[rows.length - 1].id;
	}
	// Then the copies. Keyset paging: a photo that fails stays in the set, but each pass visits
	// it once.
	after = null;
	for (;;) {
		if (opts.signal?.aborted) break;
		const rows: PhotoCopyRow[] = await sql`
			select id, storage_key as "storageKey", thumb_key as "thumbKey", sha256
			from attachment
			where (thumb_key is null or sha256 is null) and ${where(after)}
			order by id
			limit ${BATCH}`;
		if (rows.length === 0) break;
		for (let i = 0; i < rows.length; i += pool) {
			if (opts.signal?.aborted) break;
			const t0 = performance.now();
			const part = rows.slice(i, i + pool);
			const photos = await Promise.all(part.map((row) => lookAndRecord(storage, row, { sql })));
			photos.forEach((photo, j) => {
				count.photos++;
				if (photo.ok) count[photo.made ? 'made' : 'kept']++;
				else if (photo.reason !== 'later') {
					count[photo.reason]++;
					if (count.problems.length < 20) {
						count.problems.push(`${photo.reason}: ${part[j].storageKey}`);
					}
				}
			});
			if (opts.rest) await sleep((performance.now() - t0) * opts.rest);
		}
		after = rows[rows.length - 1].id;
		opts.progress?.(count);
	}
	return count;
}
