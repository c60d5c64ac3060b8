// Downscaled copies of photos (sharp), kept next to each photo as `<shop>/<id>.thumb` and recorded
// in `attachment.thumb_key` with the original's SHA-256, so an evidence pack with hundreds of
// photos reads small files only and knows which photos have a copy without probing storage.
// The copy is made when the photo is stored (photos.ts); a copy that failed, and photos stored
// before copies were recorded, are made by the background backfill (thumbs-backfill.ts) or by
// the first pack that needs them, within the pack's time budget.
// Relative imports only: scripts (photos:thumbs, bench:evidence) use this outside SvelteKit.
import { createHash } from 'node:crypto';
import { availableParallelism } from 'node:os';
import type { Sql } from 'postgres';
import sharp from 'sharp';
import type { FileStorage } from './storage-disk';

/** Pixels on a photo's long side in the copy: enough to see a witness mark or a leak. */
export const PHOTO_LONG_SIDE = 640;

/**
 * Photos shrunk at the same time: one per core, plus one being read from storage. Each holds
 * one original (≤ 10 MB) and one decode at ¼ scale, so this also bounds memory (about 20 MB each).
 */
export const SHRINK_POOL = Math.min(availableParallelism(), 4) + 1;

/** Failed tries after which the background backfill leaves a photo alone (a pack still tries). */
export const MAX_COPY_TRIES = 3;

/**
 * Milliseconds from the start of a pack after which it starts no more copies: the goal is the
 * whole pack within 10 s, and the copies still in flight (at most SHRINK_POOL, 50–400 ms each)
 * must fit in what is left. Before that, each photo still to come after a copy keeps
 * PACK_MS_PER_PHOTO_LEFT for itself (reading its kept copy and drawing it), more when its hash
 * is still to be read (PACK_HASH_BYTES_PER_MS), so a pack with many photos left stops copying
 * earlier.
 */
export const PACK_COPY_BUDGET_MS = 8000;
/**
 * After this a pack reads no more originals to hash them (less PACK_MS_PER_PHOTO_LEFT for each
 * photo after it): under load 9 on 2 cores reading and hashing cost 75 ms a photo, so a job of
 * 200 photos stored before hashes were recorded could not be hashed within 10 s. Such a photo's
 * hash is then "not read yet"; the JSON export and the background backfill read it.
 */
export const PACK_HASH_BUDGET_MS = 9000;
export const PACK_MS_PER_PHOTO_LEFT = 10;
/**
 * A photo still to come whose hash is not recorded keeps more: its original is read and hashed
 * (3 MB: 8–32 ms measured at load 4–5, so 100 bytes a microsecond is assumed).
 */
export const PACK_HASH_BYTES_PER_MS = 100_000;

// A photo is shrunk once and its copy kept, so libvips' operation cache would only hold memory.
sharp.cache(false);

/** Where a photo's downscaled copy is kept, next to it (`<shop>/<id>.thumb`). */
export function thumbKeyOf(storageKey: string): string {
	return storageKey.replace(/\.[a-z0-9]{1,5}$/, '.thumb');
}

/** SHA-256 of a file's bytes, hex (FIPS 180-4, through node:crypto). */
export function sha256Hex(bytes: Uint8Array): string {
	return createHash('sha256').update(bytes).digest('hex');
}

/** A photo row as the pack and the backfill read it. */
export interface PhotoCopyRow {
	id: string;
	storageKey: string;
	/** The recorded copy, or null: none yet (or it failed). */
	thumbKey: string | null;
	sha256: string | null;
	/** The original's size, when known: what hashing it will cost. */
	bytes?: number;
}

export type SmallPhoto =
	| { ok: true; bytes: Buffer; made: boolean; sha256: string | null }
	/**
	 * `missing`: no file under the key; `unreadable`: a file sharp cannot decode (damaged, HEIC…);
	 * `later`: no copy yet and the pack's time budget is spent (the original is kept as it is).
	 */
	| { ok: false; reason: 'missing' | 'unreadable' | 'later'; sha256: string | null };

/** What a look at one photo found, for `recordCopies`; null when the row already says it all. */
export interface CopyRecord {
	thumbKey: string | null;
	sha256: string | null;
	failed: boolean;
}

async function shrink(bytes: Uint8Array): Promise<Buffer> {
	// autoOrient in the constructor (not .rotate() before .resize()) keeps libjpeg's
	// shrink-on-load: a 4032×3024 JPEG decodes at ¼ scale, about 20 % less CPU per photo.
	return sharp(bytes, { limitInputPixels: 60_000_000, autoOrient: true })
		.resize(PHOTO_LONG_SIDE, PHOTO_LONG_SIDE, { fit: 'inside', withoutEnlargement: true })
		.jpeg({ quality: 65 })
		.toBuffer();
}

const read = (storage: FileStorage, key: string) => storage.get(key).catch(() => null);

/**
 * Makes a photo's copy from its original bytes and keeps it. `thumbKey` is null when the copy
 * could not be stored (it is still returned to draw now).
 */
export async function makeCopy(
	storage: FileStorage,
	storageKey: string,
	original: Uint8Array
): Promise<{ ok: true; small: Buffer; thumbKey: string | null } | { ok: false }> {
	let small: Buffer;
	try {
		small = await shrink(original);
	} catch {
		return { ok: false };
	}
	const thumbKey = thumbKeyOf(storageKey);
	const kept = await storage.put(thumbKey, small).then(
		() => true,
		() => false
	);
	return { ok: true, small, thumbKey: kept ? thumbKey : null };
}

/**
 * The downscaled JPEG of a stored photo: its recorded copy, a copy kept before copies were
 * recorded, or made now and kept (a phone photo costs 50–65 ms of CPU, nearly all of it reading
 * the JPEG's entropy-coded data) unless `deadline` (ms since the epoch) has passed. Also the
 * original's SHA-256 when the row has none, unless `hashBy` has passed too. Never throws.
 */
export async function smallPhoto(
	storage: FileStorage,
	row: PhotoCopyRow,
	deadline = Infinity,
	hashBy = Infinity
): Promise<{ photo: SmallPhoto; record: CopyRecord | null }> {
	const probe = row.thumbKey ?? thumbKeyOf(row.storageKey);
	const kept = await read(storage, probe);
	if (kept) {
		const bytes = Buffer.from(kept);
		if (row.sha256 && row.thumbKey) {
			return { photo: { ok: true, bytes, made: false, sha256: row.sha256 }, record: null };
		}
		const original = row.sha256 ? null : await read(storage, row.storageKey);
		const sha256 = row.sha256 ?? (original ? sha256Hex(original) : null);
		return {
			photo: { ok: true, bytes, made: false, sha256 },
			record: { thumbKey: probe, sha256, failed: false }
		};
	}
	if (Date.now() >= deadline && (row.sha256 || Date.now() >= hashBy)) {
		// Past the budget and nothing to read: only whether the original is there.
		const there = storage.exists
			? await storage.exists(row.storageKey).catch(() => false)
			: (await read(storage, row.storageKey)) !== null;
		const reason = there ? ('later' as const) : ('missing' as const);
		return { photo: { ok: false, reason, sha256: row.sha256 }, record: null };
	}
	const original = await read(storage, row.storageKey);
	if (!original) {
		return {
			photo: { ok: false, reason: 'missing', sha256: row.sha256 },
			record: { thumbKey: null, sha256: null, failed: true }
		};
	}
	const sha256 = row.sha256 ?? sha256Hex(original);
	if (Date.now() >= deadline) {
		return {
			photo: { ok: false, reason: 'later', sha256 },
			record: row.sha256 ? null : { thumbKey: null, sha256, failed: false }
		};
	}
	const copy = await makeCopy(storage, row.storageKey, original);
	if (!copy.ok) {
		return {
			photo: { ok: false, reason: 'unreadable', sha256 },
			record: { thumbKey: null, sha256, failed: true }
		};
	}
	return {
		photo: { ok: true, bytes: copy.small, made: true, sha256 },
		record: { thumbKey: copy.thumbKey, sha256, failed: copy.thumbKey === null }
	};
}

/**
 * Writes what looks at photos found, in one statement (a pack writes one per 50 photos, not a
 * commit a photo): copies and hashes once known, a failed try counted.
 */
export async function recordCopies(
	sql: Sql,
	found: { row: PhotoCopyRow; rec: CopyRecord }[]
): Promise<void> {
	if (found.length === 0) return;
	const rows = found.map(({ row, rec }) => ({
		id: row.id,
		storage_key: row.storageKey,
		thumb_key: rec.thumbKey,
		sha256: rec.sha256,
		failed: rec.failed
	}));
	await sql`
		update attachment a set
			thumb_key = coalesce(r.thumb_key, a.thumb_key),
			sha256 = coalesce(a.sha256, r.sha256),
			thumb_tries = least(a.thumb_tries + case when r.failed then 1 else 0 end, 32000)
		from json_to_recordset(${JSON.stringify(rows)}::text::json)
			as r(id uuid, storage_key text, thumb_key text, sha256 text, failed boolean)
		where a.id = r.id and a.storage_key = r.storage_key`;
}

/** A failed write only means the copy or hash is found again later: say so, go on. */
function notRecorded(e: unknown) {
	console.error(`photo copies: not recorded (${e instanceof Error ? e.message : String(e)})`);
}

/** `smallPhoto` and, with a client, its finding recorded (a failed write only means a retry). */
export async function lookAndRecord(
	storage: FileStorage,
	row: PhotoCopyRow,
	opts: { deadline?: number; sql?: Sql } = {}
): Promise<SmallPhoto> {
	const { photo, record } = await smallPhoto(storage, row, opts.deadline);
	if (record && opts.sql) await recordCopies(opts.sql, [{ row, rec: record }]).catch(notRecorded);
	return photo;
}

/**
 * The photos' small copies in the order of `rows`, at most `pool` being read or shrunk at a time
 * (sharp works off the main thread, so these run on all cores while the caller draws). With
 * `sql`, copies made and hashes found are recorded; past `deadline`, less the time kept for the
 * photos still to come, no new copy is started, and past `hashBy` no original is read.
 */
export async function* smallPhotos(
	storage: FileStorage,
	rows: PhotoCopyRow[],
	opts: { pool?: number; deadline?: number; hashBy?: number; sql?: Sql } = {}
): AsyncGenerator<SmallPhoto> {
	const pool = opts.pool ?? SHRINK_POOL;
	const deadline = opts.deadline ?? Infinity;
	const hashBy = opts.hashBy ?? Infinity;
	const found: { row: PhotoCopyRow; rec: CopyRecord }[] = [];
	const flush = async () => {
		if (opts.sql) await recordCopies(opts.sql, found.splice(0)).catch(notRecorded);
	};
	// The time each photo keeps for the ones after it (a suffix sum of their costs).
	const keep = new Array<number>(rows.length).fill(0);
	for (let k = rows.length - 2; k >= 0; k--) {
		const r = rows[k + 1];
		const hash = r.sha256 ? 0 : (r.bytes ?? 3_000_000) / PACK_HASH_BYTES_PER_MS;
		keep[k] = keep[k + 1] + PACK_MS_PER_PHOTO_LEFT + hash;
	}
	const queue: Promise<SmallPhoto>[] = [];
	let next = 0;
	const start = () => {
		const row = rows[next];
		const until = deadline - keep[next];
		const hashUntil = hashBy - (rows.length - 1 - next++) * PACK_MS_PER_PHOTO_LEFT;
		queue.push(
			smallPhoto(storage, row, until, hashUntil).then(({ photo, record }) => {
				if (record) found.push({ row, rec: record });
				return photo;
			})
		);
	};
	try {
		while (next < rows.length && queue.length < pool) start();
		while (queue.length > 0) {
			const photo = await queue.shift()!;
			if (next < rows.length) start();
			if (found.length >= 50) await flush();
			yield photo;
		}
	} finally {
		// also when the reader went away: what was made is kept and recorded
		await Promise.allSettled(queue);
		await flush();
	}
}

/**
 * Fills in (and records) the SHA-256 of each photo whose row has none, reading the originals two
 * at a time (a 3 MB photo: a few ms). A photo whose file is missing keeps null.
 */
export async function hashMissing(sql: Sql, storage: FileStorage, rows: PhotoCopyRow[]) {
	const todo = rows.filter((r) => !r.sha256);
	for (let i = 0; i < todo.length; i += 2) {
		await Promise.all(
			todo.slice(i, i + 2).map(async (row) => {
				const original = await read(storage, row.storageKey);
				if (!original) return;
				row.sha256 = sha256Hex(original);
				const rec = { thumbKey: null, sha256: row.sha256, failed: false };
				await recordCopies(sql, [{ row, rec }]).catch(notRecorded);
			})
		);
	}
}
