// Downscaled copies of photos (sharp), kept next to each photo as `<shop>/<id>.thumb`: made when
// the photo is stored, so an evidence pack with hundreds of photos only reads small files.
import sharp from 'sharp';
import type { FileStorage } from './storage';

/** Pixels on a photo's long side in the copy: enough to see a witness mark or a leak. */
export const PHOTO_LONG_SIDE = 640;

/** Where a photo's downscaled copy is kept, next to it (`<shop>/<id>.thumb`). */
export function thumbKeyOf(storageKey: string): string {
	return storageKey.replace(/\.[a-z0-9]{1,5}$/, '.thumb');
}

/**
 * Downscaled JPEG of a stored photo, or null when the file is gone or unreadable. Shrinking a
 * phone photo costs 0.1–0.2 s, so the copy is kept: the next pack of the job reads it back.
 */
export async function smallPhoto(storage: FileStorage, key: string): Promise<Buffer | null> {
	const thumbKey = thumbKeyOf(key);
	const kept = await storage.get(thumbKey).catch(() => null);
	if (kept) return Buffer.from(kept);
	const bytes = await storage.get(key).catch(() => null);
	if (!bytes) return null;
	try {
		const small = await sharp(bytes, { limitInputPixels: 60_000_000 })
			.rotate()
			.resize(PHOTO_LONG_SIDE, PHOTO_LONG_SIDE, { fit: 'inside', withoutEnlargement: true })
			.jpeg({ quality: 65 })
			.toBuffer();
		await storage.put(thumbKey, small).catch(() => {});
		return small;
	} catch {
		return null;
	}
}

/** Makes the copy at upload time; a failure only means the pack makes it later. */
export async function keepThumb(storage: FileStorage, key: string): Promise<void> {
	await smallPhoto(storage, key).catch(() => null);
}
