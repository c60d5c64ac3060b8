/**
 * What an uploaded file really is, read from its first bytes (never from its name or the
 * browser's word for it). Pure: used for photos on entries and at intake.
 */

export const MAX_PHOTO_BYTES = 10 * 1024 * 1024;

export type ImageMime = 'image/jpeg' | 'image/png' | 'image/webp';

export const IMAGE_EXTENSIONS: Record<ImageMime, string> = {
	'image/jpeg': 'jpg',
	'image/png': 'png',
	'image/webp': 'webp'
};

export type PhotoCheck =
	{ ok: true; mime: ImageMime; extension: string } | { ok: false; message: string };

const starts = (b: Uint8Array, sig: number[], at = 0) =>
	b.length >= at + sig.length && sig.every((x, i) => b[at + i] === x);

/** The image type by its signature (JPEG FF D8 FF, PNG 89 50 4E 47 0D 0A 1A 0A, RIFF…WEBP). */
export function sniffImage(bytes: Uint8Array): ImageMime | null {
	if (starts(bytes, [0xff, 0xd8, 0xff])) return 'image/jpeg';
	if (starts(bytes, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return 'image/png';
	if (starts(bytes, [0x52, 0x49, 0x46, 0x46]) && starts(bytes, [0x57, 0x45, 0x42, 0x50], 8)) {
		return 'image/webp';
	}
	return null;
}

export const MAX_FILE_NAME = 200;

/**
 * Whether a file's name may be kept with it. The name never becomes a path on disk (storage keys
 * are Benchcall's own), but it is kept and shown, so anything that is not a plain name is
 * refused: folders (`../../x.jpg`, `C:\\photos\\x.jpg`), control characters (NUL, line breaks)
 * and invisible format characters such as U+202E, which can make `gpj.exe` read as `exe.jpg`.
 */
export function checkFileName(name: string): { ok: true } | { ok: false; message: string } {
	if (/[/\\]/.test(name)) {
		return { ok: false, message: 'A file name cannot contain folders (/ or \\): rename the file.' };
	}
	if (/[\p{Cc}\p{Cf}]/u.test(name)) {
		return {
			ok: false,
			message: 'The file name has control or invisible characters: rename the file.'
		};
	}
	if (name.length > MAX_FILE_NAME) {
		return { ok: false, message: `A file name is at most ${MAX_FILE_NAME} characters.` };
	}
	return { ok: true };
}

/** Whether the bytes are a photo Benchcall keeps: JPEG, PNG or WebP, 1 byte to 10 MB. */
export function checkPhoto(bytes: Uint8Array, maxBytes = MAX_PHOTO_BYTES): PhotoCheck {
	if (bytes.length === 0) return { ok: false, message: 'The file is empty.' };
	if (bytes.length > maxBytes) {
		const mb = (maxBytes / (1024 * 1024)).toFixed(0);
		return {
			ok: false,
			message: `The photo is ${(bytes.length / (1024 * 1024)).toFixed(1)} MB; at most ${mb} MB.`
		};
	}
	const mime = sniffImage(bytes);
	if (!mime) {
		return {
			ok: false,
			message:
				'That file is not a JPEG, PNG or WebP photo (checked from its contents, not its name).'
		};
	}
	return { ok: true, mime, extension: IMAGE_EXTENSIONS[mime] };
}

/**
 * Whether reading a request body failed because it was over the server's size limit
 * (adapter-node's BODY_SIZE_LIMIT: the body stream errors with status 413).
 */
export function isTooLarge(e: unknown): boolean {
	return typeof e === 'object' && e !== null && (e as { status?: unknown }).status === 413;
}
