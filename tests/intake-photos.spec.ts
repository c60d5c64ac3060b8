import { expect, test } from '@playwright/test';
import { demo, signIn } from './helpers/auth';
import { db, jobId } from './helpers/bench-db';

// A 1×1 PNG: the 8-byte PNG signature, IHDR, IDAT and IEND chunks.
const png = Buffer.from(
	'89504e470d0a1a0a0000000d4948445200000001000000010806000000' +
		'1f15c4890000000d49444154789c6360000002000154a24f5d0000000049454e44ae426082',
	'hex'
);
// A Windows executable starts "MZ": renamed .jpg it must still be refused.
const exe = Buffer.concat([Buffer.from('MZ'), Buffer.alloc(200, 0x90)]);

test('a service writer adds intake photos to a job card; a renamed program is refused', async ({
	page
}) => {
	await signIn(page, demo.writer);
	await page.goto('/jobs/1041');
	const input = page.getByLabel('Intake photos to add');

	await input.setInputFiles({ name: 'left-side-scratch.png', mimeType: 'image/png', buffer: png });
	await page.getByRole('button', { name: 'Add photos' }).click();
	await expect(page.getByRole('status')).toHaveText('1 intake photo added.');
	const img = page.getByRole('img', { name: 'Intake photo left-side-scratch.png' });
	await expect(img).toBeVisible();
	// The card asks for the downscaled copy. This hand-made PNG is too odd for libpng to shrink,
	// so no copy exists and the original comes back, not kept by the browser: never a broken
	// picture. The link opens the original as stored.
	const src = (await img.getAttribute('src'))!;
	expect(src).toContain('size=copy');
	const shown = await page.request.get(src);
	expect(shown.headers()['content-type']).toBe('image/png');
	expect(shown.headers()['cache-control']).toContain('no-store');
	const href = await page.getByRole('link').filter({ has: img }).getAttribute('href');
	const served = await page.request.get(href!);
	expect(served.headers()['content-type']).toBe('image/png');
	expect(Buffer.from(await served.body()).equals(png)).toBe(true);

	await input.setInputFiles({ name: 'photo.jpg', mimeType: 'image/jpeg', buffer: exe });
	await page.getByRole('button', { name: 'Add photos' }).click();
	await expect(page.getByRole('alert')).toContainText('not a JPEG, PNG or WebP photo');
	await expect(page.getByRole('img', { name: /Intake photo/ })).toHaveCount(1);
});

test("another shop cannot read a shop's intake photo", async ({ browser }) => {
	const writer = await browser.newPage();
	await signIn(writer, demo.writer);
	await writer.goto('/jobs/1045');
	await writer
		.getByLabel('Intake photos to add')
		.setInputFiles({ name: 'dent.png', mimeType: 'image/png', buffer: png });
	await writer.getByRole('button', { name: 'Add photos' }).click();
	const src = await writer.getByRole('img', { name: 'Intake photo dent.png' }).getAttribute('src');

	const other = await browser.newPage();
	await signIn(other, demo.otherOwner);
	const res = await other.request.get(src!);
	expect(res.status()).toBe(404);
	await writer.close();
	await other.close();
});

test('a closed record takes no more photos: the job card says so and the API answers 409', async ({
	page,
	browser
}) => {
	// Job 1001 is a paid past service with one entry (seed).
	await signIn(page, demo.writer);
	await page.goto('/jobs/1001');
	await expect(page.getByTestId('photos-closed')).toContainText('record is closed');
	await expect(page.getByRole('button', { name: 'Add photos' })).toHaveCount(0);

	const foreman = await browser.newPage();
	await signIn(foreman, demo.foreman);
	// the Bench says so and offers no camera button on the job's entries
	await foreman.goto('/bench?job=1001');
	await expect(foreman.getByTestId('log-closed')).toContainText('record is closed');
	await expect(foreman.getByTestId('log-entry').first()).toBeVisible();
	await expect(foreman.getByTestId('photo-input')).toHaveCount(0);
	const id = await jobId(1001);
	const [first] = await db()`select id from log_entry where job_id = ${id} limit 1`;
	const res = await foreman.request.post(`/api/jobs/${id}/entries/${first.id}/photos`, {
		// what the Bench's own upload sends: the app's origin (form posts from elsewhere are refused)
		headers: { origin: new URL(foreman.url()).origin },
		multipart: { photo: { name: 'late.png', mimeType: 'image/png', buffer: png } }
	});
	expect(res.status()).toBe(409);
	expect((await res.json()).message).toMatch(/record is closed/);
	const [{ n }] = await db()`select count(*)::int as n from attachment where job_id = ${id}`;
	expect(n).toBe(0);
	await foreman.close();
});
