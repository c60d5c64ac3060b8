import { createHash } from 'node:crypto';
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PDFParse } from 'pdf-parse';
import sharp from 'sharp';
import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { client, db } from './db';
import { makeShop } from './db/fixtures';
import { toJsonExport } from '$lib/evidence/pack';
import * as s from './db/schema';
import { loadEvidence } from './evidence';
import { evidencePdf } from './evidence-pdf';
import { readPhoto, storePhoto } from './photos';
import { localDiskStorage, type FileStorage } from './storage';
import { hashMissing, MAX_COPY_TRIES, PHOTO_LONG_SIDE, sha256Hex, thumbKeyOf } from './thumbs';
import { backfillCopies } from './thumbs-backfill';

async function pdfText(pdf: Buffer): Promise<string> {
	const parser = new PDFParse({ data: new Uint8Array(pdf) });
	try {
		return (await parser.getText()).text.replace(/\s+/g, ' ');
	} finally {
		await parser.destroy();
	}
}

const images = (pdf: Buffer) => pdf.toString('latin1').match(/\/Subtype \/Image/g)?.length ?? 0;

async function jpeg(width = 2400, height = 1800) {
	const noise = { type: 'gaussian' as const, mean: 120, sigma: 30 };
	return sharp({ create: { width, height, channels: 3, background: '#5a6b7c', noise } })
		.jpeg()
		.toBuffer();
}

function photoRow(shopId: string, jobId: string, key: string, bytes: number) {
	return { shopId, jobId, fileName: 'old.jpg', mime: 'image/jpeg', bytes, storageKey: key };
}

async function rowOf(id: string) {
	const [row] = await db
		.select({
			storageKey: s.attachment.storageKey,
			thumbKey: s.attachment.thumbKey,
			thumbTries: s.attachment.thumbTries,
			sha256: s.attachment.sha256
		})
		.from(s.attachment)
		.where(eq(s.attachment.id, id));
	return row;
}

/** Storage that counts the reads of one file (the original). */
function countingReads(disk: FileStorage, key: string): FileStorage & { reads: number } {
	const counting = {
		...disk,
		reads: 0,
		async get(k: string) {
			if (k === key) counting.reads++;
			return disk.get(k);
		}
	};
	return counting;
}

/** A shop with a job, a folder of storage, and a photo stored as before copies were recorded. */
async function oldPhoto(name: string, bytes?: Buffer) {
	const f = await makeShop(name);
	const root = mkdtempSync(join(tmpdir(), 'thumbs-'));
	mkdirSync(join(root, f.shop.id));
	const disk = localDiskStorage(root);
	const original = bytes ?? (await jpeg());
	const id = crypto.randomUUID();
	const key = `${f.shop.id}/${id}.jpg`;
	writeFileSync(join(root, key), original);
	await db
		.insert(s.attachment)
		.values({ id, ...photoRow(f.shop.id, f.job.id, key, original.length) });
	return { f, disk, root, id, key, original };
}

/** A shop with a job and a photo stored the way uploads are (its copy made and recorded). */
async function newPhoto(shopName: string, fileName: string) {
	const f = await makeShop(shopName);
	const disk = localDiskStorage(mkdtempSync(join(tmpdir(), 'thumbs-')));
	const bytes = await jpeg();
	const stored = await storePhoto(
		{ shopId: f.shop.id, jobId: f.job.id, entryId: null, uploadedBy: f.tech.id },
		{ bytes: new Uint8Array(bytes), name: fileName },
		disk
	);
	if (!stored.ok) throw new Error(stored.message);
	return { f, disk, bytes, id: stored.id };
}

describe('downscaled copies of photos', () => {
	it('SHA-256 of "abc" is the FIPS 180-4 example value', () => {
		// NIST FIPS 180-4 / CSRC example values (SHA256.pdf): SHA-256("abc").
		expect(sha256Hex(new TextEncoder().encode('abc'))).toBe(
			'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad'
		);
	});

	it('records a stored photo’s copy and SHA-256 in the row that stores it', async () => {
		const { disk, bytes, id } = await newPhoto('Thumbs stored', 'fork-seal.jpg');
		const row = await rowOf(id);
		expect(row.thumbKey).toBe(thumbKeyOf(row.storageKey));
		expect(row.thumbTries).toBe(0);
		expect(row.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
		const copy = await disk.get(row.thumbKey!);
		const meta = await sharp(copy!).metadata();
		expect(Math.max(meta.width!, meta.height!)).toBe(PHOTO_LONG_SIDE);
	});

	it('serves the copy when asked, the original otherwise, and the original while no copy exists', async () => {
		const { f, disk, bytes, id } = await newPhoto('Thumbs served', 'header.jpg');
		const copy = await readPhoto(f.shop.id, id, disk, { copy: true });
		expect(copy?.copy).toBe(true);
		expect(copy?.mime).toBe('image/jpeg');
		const meta = await sharp(copy!.bytes).metadata();
		expect(Math.max(meta.width!, meta.height!)).toBe(PHOTO_LONG_SIDE);
		expect(copy!.bytes.length).toBeLessThan(bytes.length);
		const original = await readPhoto(f.shop.id, id, disk);
		expect(original?.copy).toBe(false);
		expect(Buffer.from(original!.bytes).equals(bytes)).toBe(true);
		// another shop asks for it: missing, copy or not
		const other = await makeShop('Thumbs served, other');
		expect(await readPhoto(other.shop.id, id, disk, { copy: true })).toBeNull();
		// a photo stored before copies existed: the copy asked for is the original
		const old = await oldPhoto('Thumbs served, old');
		const fallback = await readPhoto(old.f.shop.id, old.id, old.disk, { copy: true });
		expect(fallback?.copy).toBe(false);
		expect(Buffer.from(fallback!.bytes).equals(old.original)).toBe(true);
	});

	it('stores a photo whose copy fails, and the backfill makes the copy later', async () => {
		const f = await makeShop('Thumbs failed');
		const disk = localDiskStorage(mkdtempSync(join(tmpdir(), 'thumbs-')));
		const flaky: FileStorage = {
			...disk,
			async put(key, bytes) {
				if (key.endsWith('.thumb')) throw new Error('disk full for a moment');
				return disk.put(key, bytes);
			}
		};
		const stored = await storePhoto(
			{ shopId: f.shop.id, jobId: f.job.id, entryId: null, uploadedBy: f.tech.id },
			{ bytes: new Uint8Array(await jpeg()), name: 'chain.jpg' },
			flaky
		);
		if (!stored.ok) throw new Error(stored.message);
		const before = await rowOf(stored.id);
		expect(before.thumbKey).toBeNull();
		expect(before.thumbTries).toBe(1);
		const n = await backfillCopies(client, disk, { shopId: f.shop.id });
		expect(n).toMatchObject({ photos: 1, made: 1 });
		const after = await rowOf(stored.id);
		expect(after.thumbKey).toBe(thumbKeyOf(after.storageKey));
		expect(await disk.get(after.thumbKey!)).not.toBeNull();
		// Nothing left to do: a second pass finds no photo.
		expect((await backfillCopies(client, disk, { shopId: f.shop.id })).photos).toBe(0);
	});

	it('backfills photos stored before copies existed, recording copies already on disk', async () => {
		const { f, disk, root, id, key, original } = await oldPhoto('Thumbs old');
		// A second old photo whose copy was made (by an earlier version) but never recorded.
		const id2 = crypto.randomUUID();
		const key2 = `${f.shop.id}/${id2}.jpg`;
		writeFileSync(join(root, key2), original);
		writeFileSync(join(root, thumbKeyOf(key2)), await jpeg(640, 480));
		await db
			.insert(s.attachment)
			.values({ id: id2, ...photoRow(f.shop.id, f.job.id, key2, original.length) });
		const n = await backfillCopies(client, disk, { shopId: f.shop.id, rest: 1 });
		expect(n).toMatchObject({ photos: 2, made: 1, kept: 1, missing: 0, unreadable: 0 });
		for (const [pid, k] of [
			[id, key],
			[id2, key2]
		]) {
			const row = await rowOf(pid);
			expect(row.thumbKey).toBe(thumbKeyOf(k));
			expect(row.sha256).toBe(sha256Hex(original));
		}
	});

	it('gives up on a photo that cannot be read after a few tries, and says which', async () => {
		const damaged = (await jpeg()).subarray(0, 600); // a JPEG cut short
		const { f, disk, id, key } = await oldPhoto('Thumbs damaged', damaged);
		for (let i = 0; i < MAX_COPY_TRIES; i++) {
			const n = await backfillCopies(client, disk, { shopId: f.shop.id });
			expect(n).toMatchObject({ photos: 1, unreadable: 1, problems: [`unreadable: ${key}`] });
		}
		expect((await rowOf(id)).thumbTries).toBe(MAX_COPY_TRIES);
		expect((await backfillCopies(client, disk, { shopId: f.shop.id })).photos).toBe(0);
		// An operator's run (photos:thumbs) tries it again.
		const all = await backfillCopies(client, disk, { shopId: f.shop.id, maxTries: null });
		expect(all.photos).toBe(1);
	});

	it('a pack that meets a photo without a copy makes it once and keeps it', async () => {
		const { f, disk, id, key, original } = await oldPhoto('Thumbs pack');
		const counting = countingReads(disk, key);
		const first = await evidencePdf((await loadEvidence(client, f.shop.id, f.job.id))!, counting, {
			sql: client
		});
		expect(images(first)).toBe(1);
		const row = await rowOf(id);
		expect(row.thumbKey).toBe(thumbKeyOf(key));
		expect(row.sha256).toBe(sha256Hex(original));
		expect(await pdfText(first)).toContain(`SHA-256 ${sha256Hex(original)}`);
		// The next pack reads the kept copy only: the original is not read again.
		counting.reads = 0;
		const pack = (await loadEvidence(client, f.shop.id, f.job.id))!;
		expect(pack.photos[0]).toMatchObject({
			thumbKey: thumbKeyOf(key),
			sha256: sha256Hex(original)
		});
		const second = await evidencePdf(pack, counting, { sql: client });
		expect(images(second)).toBe(1);
		expect(counting.reads).toBe(0);
	});

	it('past its time budget a pack puts a line for the photo, with its SHA-256', async () => {
		const { f, disk, id, key, original } = await oldPhoto('Thumbs budget');
		let left = 0;
		const pack = (await loadEvidence(client, f.shop.id, f.job.id))!;
		const pdf = await evidencePdf(pack, disk, {
			sql: client,
			deadline: 0, // spent before the first photo
			leftForLater: (n) => (left = n)
		});
		expect(images(pdf)).toBe(0);
		expect(left).toBe(1);
		const text = await pdfText(pdf);
		expect(text).toContain(`Photo 1: copy being made; download the original at /api/photos/${id}`);
		expect(text).toContain(`SHA-256 ${sha256Hex(original)}`);
		// The original is untouched and its hash recorded; the copy is left to the backfill.
		expect(sha256Hex((await disk.get(key))!)).toBe(sha256Hex(original));
		const row = await rowOf(id);
		expect(row).toMatchObject({ thumbKey: null, thumbTries: 0, sha256: sha256Hex(original) });
		// With the hash recorded, a pack past its budget does not read the original at all.
		const counting = countingReads(disk, key);
		const again = await evidencePdf((await loadEvidence(client, f.shop.id, f.job.id))!, counting, {
			sql: client,
			deadline: 0
		});
		expect(counting.reads).toBe(0);
		expect(await pdfText(again)).toContain(`Photo 1: copy being made`);
		expect(await backfillCopies(client, disk, { shopId: f.shop.id })).toMatchObject({ made: 1 });
	});

	it('out of time to read an original, a pack says its hash is not read yet', async () => {
		const { f, disk, id } = await oldPhoto('Thumbs no time');
		const pack = (await loadEvidence(client, f.shop.id, f.job.id))!;
		const pdf = await evidencePdf(pack, disk, { sql: client, deadline: 0, hashBy: 0 });
		const text = await pdfText(pdf);
		expect(text).toContain(`Photo 1: copy being made; download the original at /api/photos/${id}`);
		expect(text).toContain('SHA-256 not read yet: the JSON export reads it');
		expect((await rowOf(id)).sha256).toBeNull();
	});

	it('the JSON export gives every photo’s SHA-256, read once for photos stored before hashes', async () => {
		const { f, disk, id, original } = await oldPhoto('Thumbs json');
		const pack = (await loadEvidence(client, f.shop.id, f.job.id))!;
		expect(pack.photos[0].sha256).toBeNull();
		await hashMissing(client, disk, pack.photos);
		expect(toJsonExport(pack).photos).toEqual([
			expect.objectContaining({ id, sha256: sha256Hex(original) })
		]);
		expect((await rowOf(id)).sha256).toBe(sha256Hex(original));
	});
});
