// Photos of a job: on a log entry (the Bench) or taken at intake (the job card). One set of
// rules for both: type from the bytes, at most 10 MB, stored behind the storage interface.
import { and, asc, eq, isNull } from 'drizzle-orm';
import { checkFileName, checkPhoto } from '$lib/uploads/check';
import { client, db } from './db';
import { isClosedRecord } from './db/errors';
import * as s from './db/schema';
import { uploads, type FileStorage } from './storage';
import { makeCopy, sha256Hex } from './thumbs';
import { backfillCopies } from './thumbs-backfill';
import { closedStates } from '$lib/jobs/states';
import { isUuid } from '$lib/ids';
import { failure, type Result } from '$lib/result';
import type { EntryView } from '$lib/bench/types';
import { getJob, mayWrite, NOT_FOUND, type Actor } from './bench/job';
import { readEntry } from './log/read';

/** A closed record (invoiced, paid or cancelled) is a `conflict`; a file it cannot take, `invalid`. */
export type StoreResult = Result<{ id: string }>;

export const closedPhotoMessage =
	'This job’s record is closed (invoiced, paid or cancelled): it takes no more photos.';

/**
 * Checks and stores one photo for a job of the shop (the caller has checked the job and the
 * entry belong to the shop). Its downscaled copy is made and kept first, so the row records it
 * (and the original's SHA-256) in the statement that stores the photo; a copy that fails is made
 * again by the background backfill. The files are removed again if the row cannot be written.
 */
export async function storePhoto(
	target: { shopId: string; jobId: string; entryId: string | null; uploadedBy: string },
	file: { bytes: Uint8Array; name: string },
	storage: FileStorage = uploads()
): Promise<StoreResult> {
	const named = checkFileName(file.name);
	if (!named.ok) return failure('invalid', named.message);
	const check = checkPhoto(file.bytes);
	if (!check.ok) return failure('invalid', check.message);
	const id = crypto.randomUUID();
	const key = `${target.shopId}/${id}.${check.extension}`;
	await storage.put(key, file.bytes);
	const copy = await makeCopy(storage, key, file.bytes);
	const thumbKey = copy.ok ? copy.thumbKey : null;
	try {
		await db.insert(s.attachment).values({
			id,
			shopId: target.shopId,
			jobId: target.jobId,
			entryId: target.entryId,
			fileName: file.name || `photo.${check.extension}`,
			mime: check.mime,
			bytes: file.bytes.length,
			storageKey: key,
			thumbKey,
			thumbTries: thumbKey ? 0 : 1,
			sha256: sha256Hex(file.bytes),
			uploadedBy: target.uploadedBy
		});
	} catch (e) {
		await storage.remove(key).catch(() => {});
		if (thumbKey) await storage.remove(thumbKey).catch(() => {});
		if (isClosedRecord(e)) return failure('conflict', closedPhotoMessage);
		throw e;
	}
	if (!thumbKey && storage === uploads()) makeMissingCopies(60_000);
	return { ok: true, id };
}

let copying: Promise<void> | null = null;
let again = false;
const stopCopying = new AbortController();
process.once('sveltekit:shutdown', () => stopCopying.abort());

/**
 * Makes the app's missing photo copies in the background after `delayMs`: one photo at a time,
 * resting three times as long as each took (a quarter of one core at most). Called at start
 * (hooks.server.ts), after an upload whose copy failed and after a pack that left photos for
 * later; a call while a pass runs asks for one more pass.
 */
export function makeMissingCopies(delayMs = 0): void {
	if (copying) {
		again = true;
		return;
	}
	const started = performance.now();
	copying = (async () => {
		await new Promise((r) => setTimeout(r, delayMs).unref());
		do {
			again = false;
			const n = await backfillCopies(client, uploads(), { rest: 3, signal: stopCopying.signal });
			if (n.photos > 0) {
				const secs = ((performance.now() - started) / 1000).toFixed(0);
				console.log(
					`photo copies: ${n.made} made, ${n.kept} found, ${n.missing} files missing, ` +
						`${n.unreadable} unreadable (${secs} s, in the background)`
				);
			}
		} while (again && !stopCopying.signal.aborted);
	})()
		.catch((e: unknown) => {
			console.error(`photo copies: stopped (${e instanceof Error ? e.message : String(e)})`);
		})
		.finally(() => {
			copying = null;
		});
}

/** Photos taken at intake (not on an entry), oldest first. */
export function listIntakePhotos(shopId: string, jobId: string) {
	return db
		.select({
			id: s.attachment.id,
			fileName: s.attachment.fileName,
			createdAt: s.attachment.createdAt
		})
		.from(s.attachment)
		.where(
			and(
				eq(s.attachment.shopId, shopId),
				eq(s.attachment.jobId, jobId),
				isNull(s.attachment.entryId)
			)
		)
		.orderBy(asc(s.attachment.createdAt));
}

export type PhotoResult = Result<{ entry: EntryView }>;

/** Attaches a photo to an entry of the job: type checked from the bytes, at most 10 MB. */
export async function attachPhoto(
	actor: Actor,
	jobId: string,
	entryId: string,
	file: { bytes: Uint8Array; name: string },
	storage: FileStorage = uploads()
): Promise<PhotoResult> {
	const job = await getJob(actor.shopId, jobId);
	if (!job) return failure('not_found', NOT_FOUND);
	if (!mayWrite(actor, job)) return failure('forbidden', 'This job is not assigned to you.');
	if (closedStates.includes(job.state)) return failure('conflict', closedPhotoMessage);
	if (!isUuid(entryId)) return failure('not_found', 'No such entry on this job.');
	const [entry] = await db
		.select({ id: s.logEntry.id })
		.from(s.logEntry)
		.where(
			and(
				eq(s.logEntry.shopId, actor.shopId),
				eq(s.logEntry.jobId, jobId),
				eq(s.logEntry.id, entryId)
			)
		);
	if (!entry) return failure('not_found', 'No such entry on this job.');
	const stored = await storePhoto(
		{ shopId: actor.shopId, jobId, entryId, uploadedBy: actor.id },
		file,
		storage
	);
	if (!stored.ok) return stored;
	return { ok: true, entry: (await readEntry(actor.shopId, entryId))! };
}

/** A stored photo of the shop (or its copy), or null (another shop's photo reads as missing). */
export async function readPhoto(
	shopId: string,
	id: string,
	storage: FileStorage = uploads(),
	opts: { copy?: boolean } = {}
): Promise<{ mime: string; bytes: Uint8Array; copy: boolean } | null> {
	if (!isUuid(id)) return null;
	const [row] = await db
		.select({
			mime: s.attachment.mime,
			key: s.attachment.storageKey,
			thumbKey: s.attachment.thumbKey
		})
		.from(s.attachment)
		.where(and(eq(s.attachment.shopId, shopId), eq(s.attachment.id, id)));
	if (!row) return null;
	// The downscaled copy (thumbs.ts: JPEG, 640 px on its long side) when asked for and made;
	// else the original, so a picture always shows.
	if (opts.copy && row.thumbKey) {
		const small = await storage.get(row.thumbKey);
		if (small) return { mime: 'image/jpeg', bytes: small, copy: true };
	}
	const bytes = await storage.get(row.key);
	return bytes ? { mime: row.mime, bytes, copy: false } : null;
}
