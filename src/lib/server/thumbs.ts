// Downscaled copies of photos (sharp), kept next to each photo as `<shop>/<id>.thumb`: made when
// the photo is stored, so an evidence pack with hundreds of photos only reads small files. Photos
// stored before copies existed (or whose copy failed) are shrunk when a pack first needs them, or
// ahead of time by `npm run photos:thumbs`.
import { availableParallelism } from 'node:os';
import sharp from 'sharp';
import type { FileStorage } from './storage';

/** Pixels on a photo's long side in the copy: enough to see a witness mark or a leak. */
export const PHOTO_LONG_SIDE = 640;

/**
 * Photos shrunk at the same time: one per core, plus one being read from storage. Each holds
 * one original (≤ 10 MB) and one decode at ¼ scale, so this also bounds memory (about 20 MB each).
 */
export const SHRINK_POOL = Math.min(availableParallelism(), 4) + 1;

// A photo is shrunk once and its copy kept, so libvips' operation cache would only hold memory.
sharp.cache(false);

/** Where a photo's downscaled copy is kept, next to it (`<shop>/<id>.thumb`). */
export function thumbKeyOf(storageKey: string): string {
	return storageKey.replace(/\.[a-z0-9]{1,5}$/, '.thumb');
}

export type SmallPhoto =
	| { ok: true; bytes: Buffer; made: boolean }
	/** `missing`: no file under the key; `unreadable`: a file sharp cannot decode (damaged, HEIC…) */
	| { ok: false; reason: 'missing' | 'unreadable' };

async function shrink(bytes: Uint8Array): Promise<Buffer> {
	// autoOrient in the constructor (not .rotate() before .resize()) keeps libjpeg's
	// shrink-on-load: a 4032×3024 JPEG decodes at ¼ scale, about 20 % less CPU per photo.
	return sharp(bytes, { limitInputPixels: 60_000_000, autoOrient: true })
		.resize(PHOTO_LONG_SIDE, PHOTO_LONG_SIDE, { fit: 'inside', withoutEnlargement: true })
		.jpeg({ quality: 65 })
		.toBuffer();
}

/**
 * The downscaled JPEG of a stored photo: the kept copy, or made now and kept (a phone photo costs
 * 50–65 ms of CPU, nearly all of it reading the JPEG's entropy-coded data). Never throws.
 */
export async function smallPhoto(storage: FileStorage, key: string): Promise<SmallPhoto> {
	const thumbKey = thumbKeyOf(key);
	const kept = await storage.get(thumbKey).catch(() => null);
	if (kept) return { ok: true, bytes: Buffer.from(kept), made: false };
	const original = await storage.get(key).catch(() => null);
	if (!original) return { ok: false, reason: 'missing' };
	let small: Buffer;
	try {
		small = await shrink(original);
	} catch {
		return { ok: false, reason: 'unreadable' };
	}
	await storage.put(thumbKey, small).catch(() => {});
	return { ok: true, bytes: small, made: true };
}

/** Makes the copy at upload time; a failure only means the pack makes it later. */
export async function keepThumb(storage: FileStorage, key: string): Promise<void> {
	await smallPhoto(storage, key);
}

/**
 * The photos' small copies in the order of `keys`, at most `pool` being read or shrunk at a time
 * (sharp works off the main thread, so these run on all cores while the caller draws).
 */
export async function* smallPhotos(
	storage: FileStorage,
	keys: string[],
	pool = SHRINK_POOL
): AsyncGenerator<SmallPhoto> {
	const queue: Promise<SmallPhoto>[] = [];
	let next = 0;
	while (next < keys.length && queue.length < pool) queue.push(smallPhoto(storage, keys[next++]));
	while (queue.length > 0) {
		const photo = await queue.shift()!;
		if (next < keys.length) queue.push(smallPhoto(storage, keys[next++]));
		yield photo;
	}
}
