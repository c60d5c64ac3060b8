// Photo uploads, through the Bench's API and the job card's intake form, with files that are not
// what they claim: wrong type, wrong first bytes, too large, names that climb out of a folder or
// hide their extension. Each is refused with words, and leaves no row and no file behind.
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { expect, test } from '@playwright/test';
import { demo } from '../helpers/auth';
import { jobRows, makeFuzzJob, tinyPng, uploadsDir } from './data';
import { send, signInSession } from './http';

type Job = Awaited<ReturnType<typeof makeFuzzJob>>;

interface Upload {
	what: string;
	name: string;
	type: string;
	bytes: Uint8Array;
	/** Words the refusal must hold. */
	says: RegExp;
	status?: number;
}

const MB = 1024 * 1024;
const jpegHead = [0xff, 0xd8, 0xff, 0xe0];
const sized = (n: number, head: number[]) => {
	const b = new Uint8Array(n);
	b.set(head);
	return b;
};
const text = (s: string) => new TextEncoder().encode(s);
const notAPhoto = /not a JPEG, PNG or WebP photo/;

// Signatures: PNG (RFC 2083 §3.1), JPEG SOI FF D8 FF (ITU-T T.81), GIF89a (the GIF89a
// specification, section 17), PDF "%PDF-" (ISO 32000-1 §7.5.2), PE "MZ" (the PE/COFF specification).
const refused: Upload[] = [
	{
		what: 'text named .jpg',
		name: 'photo.jpg',
		type: 'image/jpeg',
		bytes: text('hello'),
		says: notAPhoto
	},
	{
		what: 'SVG with a script named .png',
		name: 'x.png',
		type: 'image/png',
		bytes: text('<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>'),
		says: notAPhoto
	},
	{
		what: 'GIF (a real image, not taken)',
		name: 'a.gif',
		type: 'image/gif',
		bytes: text('GIF89a\u0001\u0000\u0001\u0000'),
		says: notAPhoto
	},
	{
		what: 'PDF named .jpg',
		name: 'invoice.jpg',
		type: 'image/jpeg',
		bytes: text('%PDF-1.7\n'),
		says: notAPhoto
	},
	{
		what: 'program named .png',
		name: 'setup.png',
		type: 'image/png',
		bytes: Uint8Array.from([0x4d, 0x5a, 0x90, 0, 3, 0]),
		says: notAPhoto
	},
	{
		what: 'PNG signature cut short',
		name: 'short.png',
		type: 'image/png',
		bytes: tinyPng.subarray(0, 6),
		says: notAPhoto
	},
	{
		what: 'PNG with one signature byte wrong',
		name: 'bent.png',
		type: 'image/png',
		bytes: Uint8Array.from([
			0x89,
			0x50,
			0x4e,
			0x47,
			0x0d,
			0x0a,
			0x1a,
			0x0b,
			...tinyPng.subarray(8)
		]),
		says: notAPhoto
	},
	{
		what: 'empty file',
		name: 'empty.jpg',
		type: 'image/jpeg',
		bytes: new Uint8Array(),
		says: /empty|Choose/
	},
	{
		what: 'one byte over 10 MB',
		name: 'big.jpg',
		type: 'image/jpeg',
		bytes: sized(10 * MB + 1, jpegHead),
		says: /larger than 10 MB|at most 10 MB/
	},
	{
		what: 'over the server’s body limit',
		name: 'huge.jpg',
		type: 'image/jpeg',
		bytes: sized(13 * MB, jpegHead),
		says: /10 MB/,
		status: 413
	},
	{
		what: 'name climbing out of its folder',
		name: '../../etc/passwd.png',
		type: 'image/png',
		bytes: tinyPng,
		says: /cannot contain folders/
	},
	{
		what: 'Windows path in the name',
		name: '..\\..\\Windows\\x.png',
		type: 'image/png',
		bytes: tinyPng,
		says: /cannot contain folders/
	},
	{
		what: 'right-to-left override hiding .exe',
		name: 'photo\u202Egnp.exe',
		type: 'image/png',
		bytes: tinyPng,
		says: /control or invisible/
	},
	{
		what: 'NUL in the name',
		name: 'x.png\u0000.exe',
		type: 'image/png',
		bytes: tinyPng,
		says: /control or invisible|NUL/
	}
];

/**
 * The shop folder's files. Other tests (and the app's background pass, which makes downscaled
 * copies) write to the same folder at the same time, so a refused upload is checked by what
 * appeared meanwhile that no photo row owns (a file is named by its row's id), not by a count.
 */
function files(shopDir: string): Set<string> {
	try {
		return new Set(readdirSync(shopDir));
	} catch {
		return new Set();
	}
}

async function orphansSince(shopDir: string, before: Set<string>): Promise<string[]> {
	const { db } = await import('../helpers/bench-db');
	const added = [...files(shopDir)].filter((f) => !before.has(f));
	const ids = added.map((f) => f.split('.')[0]).filter((id) => /^[0-9a-f-]{36}$/.test(id));
	const owned = ids.length
		? new Set(
				(await db()`select id from attachment where id = any(${ids}::uuid[])`).map((r) => r.id)
			)
		: new Set();
	return added.filter((f) => !owned.has(f.split('.')[0]));
}

async function shopDir(): Promise<string> {
	const { db } = await import('../helpers/bench-db');
	const [shop] = await db()`select id from shop where name like 'Kettle Street%'`;
	return join(uploadsDir, shop.id as string);
}

function form(u: Pick<Upload, 'name' | 'type' | 'bytes'>) {
	const fd = new FormData();
	fd.append('photo', new Blob([u.bytes as Uint8Array<ArrayBuffer>], { type: u.type }), u.name);
	return fd;
}

/** The Bench: POST /api/jobs/[jobId]/entries/[entryId]/photos (JSON answers). */
async function benchUpload(session: string, job: Job, u: Pick<Upload, 'name' | 'type' | 'bytes'>) {
	const a = await send(`/api/jobs/${job.id}/entries/${job.overEntryId}/photos`, {
		session,
		body: { multipart: form(u) }
	});
	return { status: a.status, message: a.text };
}

/** The job card: the `photo` action, as the page's enhanced form sends it. */
async function intakeUpload(session: string, job: Job, u: Pick<Upload, 'name' | 'type' | 'bytes'>) {
	const a = await send(`/jobs/${job.number}?/photo`, {
		session,
		body: { multipart: form(u) },
		headers: { accept: 'application/json' }
	});
	const r = JSON.parse(a.text) as {
		type: string;
		status?: number;
		data?: string;
		error?: { message: string };
	};
	return { status: r.status ?? a.status, message: r.data ?? r.error?.message ?? '' };
}

const ways = [
	{ name: 'the Bench photo API', who: demo.foreman, upload: benchUpload, ok: 201 },
	{ name: 'the job card’s intake photos', who: demo.writer, upload: intakeUpload, ok: 200 }
];

for (const way of ways) {
	test(`${way.name}: files that are not photos, too large or oddly named are refused, nothing kept`, async () => {
		test.setTimeout(60_000);
		const job = await makeFuzzJob();
		const session = await signInSession(way.who);
		const dir = await shopDir();
		const problems: string[] = [];
		for (const u of refused) {
			const rows = await jobRows(job.id);
			const onDisk = files(dir);
			const a = await way.upload(session, job, u);
			if (a.status !== (u.status ?? 400))
				problems.push(`${u.what}: answered ${a.status} ${a.message}`);
			else if (!u.says.test(a.message)) problems.push(`${u.what}: said "${a.message}"`);
			if ((await jobRows(job.id)).photos !== rows.photos)
				problems.push(`${u.what}: a row was kept`);
			// another test's upload may have its file a moment before its row: ask again until
			// every new file has its row; a file a refusal left never will
			let orphans = await orphansSince(dir, onDisk);
			for (let i = 0; orphans.length && i < 5; i++) {
				await new Promise((r) => setTimeout(r, 400));
				orphans = await orphansSince(dir, onDisk);
			}
			if (orphans.length) problems.push(`${u.what}: a file was kept (${orphans.join(', ')})`);
		}
		expect(problems).toEqual([]);

		// The control: a real PNG with a plain name is kept, once, and served back as an image.
		const before = await jobRows(job.id);
		const good = await way.upload(session, job, {
			name: 'rear axle.png',
			type: 'image/png',
			bytes: tinyPng
		});
		expect(good.status, good.message).toBe(way.ok);
		expect((await jobRows(job.id)).photos).toBe(before.photos + 1);
		const { db } = await import('../helpers/bench-db');
		const [photo] = await db()`
			select id, file_name, mime from attachment where job_id = ${job.id} order by created_at desc limit 1`;
		expect(photo.file_name).toBe('rear axle.png');
		const served = await send(`/api/photos/${photo.id}`, { session });
		expect(served.status).toBe(200);
		expect(served.contentType).toBe('image/png');
		expect(served.headers.get('x-content-type-options')).toBe('nosniff');
		// Lists ask for the downscaled copy, made at upload: a JPEG (thumbs.ts).
		const copy = await send(`/api/photos/${photo.id}?size=copy`, { session });
		expect(copy.status).toBe(200);
		expect(copy.contentType).toBe('image/jpeg');
		const odd = await send(`/api/photos/${photo.id}?size=huge`, { session });
		expect(odd.status).toBe(400);
		expect(odd.text).toContain('size must be');
	});
}
