// Photos for the evidence pack's test and benchmark, made with sharp: phone-sized JPEGs that
// compress and shrink like real ones (smooth colour with sensor grain, not flat or pure noise),
// PNG screenshots, and files no pack can draw (HEIC, a JPEG cut short, a file gone from storage).
import sharp from 'sharp';

export interface TestPhoto {
	kind: 'jpeg' | 'png' | 'heic' | 'cut-short' | 'missing';
	ext: string;
	mime: string;
	/** null: the row names a file that is not in storage */
	bytes: Buffer | null;
}

/** A small repeatable pseudo-random sequence (LCG, Numerical Recipes constants). */
function randoms(seed: number) {
	let x = (seed * 2654435761) >>> 0;
	return () => (x = (x * 1664525 + 1013904223) >>> 0) / 2 ** 32;
}

async function phonePhoto(seed: number, width: number, height: number, grain: Buffer) {
	const next = randoms(seed + 1);
	const px = Buffer.alloc(40 * 30 * 3);
	for (let i = 0; i < px.length; i++) px[i] = Math.floor(next() * 256);
	return sharp(px, { raw: { width: 40, height: 30, channels: 3 } })
		.resize(width, height, { kernel: 'cubic' })
		.composite([{ input: grain, blend: 'overlay' }])
		.jpeg({ quality: 88 })
		.toBuffer();
}

async function screenshot(seed: number) {
	const next = randoms(seed + 7);
	const px = Buffer.alloc(32 * 20 * 3);
	for (let i = 0; i < px.length; i++) px[i] = 160 + Math.floor(next() * 96);
	return sharp(px, { raw: { width: 32, height: 20, channels: 3 } })
		.resize(2560, 1600, { kernel: 'nearest' })
		.png()
		.toBuffer();
}

/** An ISO BMFF header of a HEIC file (`ftyp` box, brand `heic`) and no decodable image after it. */
function heicLike(): Buffer {
	const ftyp = Buffer.from('00000018667479706865696300000000686569636d696631', 'hex');
	return Buffer.concat([ftyp, Buffer.alloc(4096, 0x5a)]);
}

/**
 * `count` photos: all but ten are phone JPEGs (`width`×`height`, eight different ones in turn);
 * the last ten are 4 PNG screenshots, 2 HEIC, 2 JPEGs cut short and 2 missing files.
 */
export async function testPhotos(count: number, width = 4032, height = 3024): Promise<TestPhoto[]> {
	const grain = await sharp({
		create: {
			width,
			height,
			channels: 3,
			background: '#808080',
			noise: { type: 'gaussian', mean: 128, sigma: 14 }
		}
	})
		.png({ compressionLevel: 0 })
		.toBuffer();
	const jpegs: Buffer[] = [];
	for (let i = 0; i < Math.min(8, count); i++)
		jpegs.push(await phonePhoto(i, width, height, grain));
	const jpeg = (bytes: Buffer): TestPhoto => ({
		kind: 'jpeg',
		ext: 'jpg',
		mime: 'image/jpeg',
		bytes
	});
	const odd: TestPhoto[] = [];
	for (let i = 0; i < 4; i++) {
		odd.push({ kind: 'png', ext: 'png', mime: 'image/png', bytes: await screenshot(i) });
	}
	odd.push(
		...[0, 1].map((): TestPhoto => ({
			kind: 'heic',
			ext: 'jpg',
			mime: 'image/jpeg',
			bytes: heicLike()
		}))
	);
	odd.push(
		...[0, 1].map((i): TestPhoto => ({
			kind: 'cut-short',
			ext: 'jpg',
			mime: 'image/jpeg',
			bytes: jpegs[i % jpegs.length].subarray(0, jpegs[i % jpegs.length].length >> 2)
		}))
	);
	odd.push(
		...[0, 1].map((): TestPhoto => ({
			kind: 'missing',
			ext: 'jpg',
			mime: 'image/jpeg',
			bytes: null
		}))
	);
	const photos: TestPhoto[] = [];
	for (let i = 0; i < count - odd.length; i++) photos.push(jpeg(jpegs[i % jpegs.length]));
	return [...photos, ...odd.slice(0, count)];
}
