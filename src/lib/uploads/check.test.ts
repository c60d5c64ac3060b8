import { describe, expect, it } from 'vitest';
import {
	MAX_FILE_NAME,
	MAX_PHOTO_BYTES,
	checkFileName,
	checkPhoto,
	isTooLarge,
	sniffImage
} from './check';

// Signatures: JPEG SOI marker FF D8 FF (ITU-T T.81 / JFIF), PNG signature (RFC 2083 §3.1, the
// PNG specification), WebP in a RIFF container (RFC 9649 §2).
const jpeg = Uint8Array.from([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46]);
const png = Uint8Array.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]);
const webp = Uint8Array.from([
	0x52, 0x49, 0x46, 0x46, 0x24, 0, 0, 0, 0x57, 0x45, 0x42, 0x50, 0x56, 0x50, 0x38, 0x20
]);
// A Windows program starts with "MZ" (the PE/COFF specification's MS-DOS stub).
const exe = Uint8Array.from([0x4d, 0x5a, 0x90, 0x00, 0x03, 0x00, 0x00, 0x00]);

describe('sniffImage', () => {
	it('tells JPEG, PNG and WebP by their first bytes', () => {
		expect(sniffImage(jpeg)).toBe('image/jpeg');
		expect(sniffImage(png)).toBe('image/png');
		expect(sniffImage(webp)).toBe('image/webp');
	});

	it('refuses a program, a RIFF that is not WebP, text and truncated signatures', () => {
		expect(sniffImage(exe)).toBeNull();
		const wav = Uint8Array.from([...webp.slice(0, 8), 0x57, 0x41, 0x56, 0x45]);
		expect(sniffImage(wav)).toBeNull();
		expect(
			sniffImage(new TextEncoder().encode('<svg xmlns="http://www.w3.org/2000/svg"/>'))
		).toBeNull();
		expect(sniffImage(png.slice(0, 4))).toBeNull();
		expect(sniffImage(new Uint8Array())).toBeNull();
	});
});

describe('checkPhoto', () => {
	it('accepts a photo up to the limit and names its extension', () => {
		expect(checkPhoto(png)).toEqual({ ok: true, mime: 'image/png', extension: 'png' });
		const big = new Uint8Array(MAX_PHOTO_BYTES);
		big.set(jpeg);
		expect(checkPhoto(big)).toMatchObject({ ok: true, mime: 'image/jpeg' });
	});

	it('refuses an .exe whatever its name, an empty file and one byte over 10 MB', () => {
		expect(checkPhoto(exe)).toMatchObject({ ok: false });
		expect(checkPhoto(new Uint8Array())).toEqual({ ok: false, message: 'The file is empty.' });
		const over = new Uint8Array(MAX_PHOTO_BYTES + 1);
		over.set(jpeg);
		const r = checkPhoto(over);
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.message).toContain('at most 10 MB');
	});
});

describe('checkFileName', () => {
	it('keeps plain names, with spaces, dots and letters of any script', () => {
		for (const name of [
			'IMG_2041.JPG',
			'rear axle, after.png',
			'photo..jpg',
			'заднее колесо.webp'
		]) {
			expect(checkFileName(name), name).toEqual({ ok: true });
		}
		expect(checkFileName('a'.repeat(MAX_FILE_NAME))).toEqual({ ok: true });
	});

	it('refuses folders, in either slash, however they climb', () => {
		for (const name of ['../../etc/passwd.jpg', '..\\..\\boot.png', 'C:\\Users\\x.jpg', '/x.png']) {
			const r = checkFileName(name);
			expect(r.ok, name).toBe(false);
			if (!r.ok) expect(r.message).toContain('cannot contain folders');
		}
	});

	it('refuses NUL, line breaks and the right-to-left override that hides an extension', () => {
		for (const name of ['x.jpg\u0000.exe', 'a\nb.png', 'photo\u202Egpj.exe', 'x\u200B.png']) {
			const r = checkFileName(name);
			expect(r.ok, JSON.stringify(name)).toBe(false);
			if (!r.ok) expect(r.message).toContain('control or invisible');
		}
		expect(checkFileName('a'.repeat(MAX_FILE_NAME + 1)).ok).toBe(false);
	});
});

describe('isTooLarge', () => {
	it('knows the body-size error by its 413 status, and nothing else', () => {
		expect(
			isTooLarge(Object.assign(new Error('Content-length exceeds limit'), { status: 413 }))
		).toBe(true);
		expect(isTooLarge(new TypeError('Failed to parse body as FormData.'))).toBe(false);
		expect(isTooLarge(null)).toBe(false);
		expect(isTooLarge('413')).toBe(false);
	});
});
