// Dates on forms are typed in the shop's style (its locale), not the browser's, and reach the
// server as ISO days; the evidence pack's PDF streams whole. The second demo shop is switched to
// en-US for the date test and put back afterwards.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { expect, test } from '@playwright/test';
import { demo, signIn } from './helpers/auth';
import { db } from './helpers/bench-db';

// The browser says German; the shop says American: the shop wins.
test.use({ locale: 'de-DE' });

test('the Jobs filter takes dates in the shop’s order and says so for a day that is none', async ({
	page
}) => {
	const [shop] = await db()`select id, locale from shop where name like 'Harbour Lane%'`;
	await db()`update shop set locale = 'en-US' where id = ${shop.id}`;
	try {
		await signIn(page, demo.otherOwner);
		await page.goto('/jobs');
		const from = page.getByRole('textbox', { name: 'Opened from (mm/dd/yyyy)' });
		const to = page.getByRole('textbox', { name: 'Opened to (mm/dd/yyyy)' });
		await expect(page.getByTestId('date-field-hint').first()).toHaveText('mm/dd/yyyy');
		// Touch-sized: the field and its calendar button are at least 44 px tall.
		expect((await from.boundingBox())!.height).toBeGreaterThanOrEqual(44);
		const pickBox = await page.getByRole('button', { name: /Pick the opened from/ }).boundingBox();
		expect(pickBox!.height).toBeGreaterThanOrEqual(44);

		await from.fill('13/45/2026');
		await from.blur();
		await expect(page.getByTestId('date-field-error').first()).toHaveText(
			'“13/45/2026” is not a day of the calendar: write it as mm/dd/yyyy, e.g. 12/4/2026.'
		);
		await from.fill('12/1/2026');
		await to.fill('12/4/26');
		await page.getByRole('button', { name: 'Show', exact: true }).click();
		await expect(page).toHaveURL(/[?&]from=2026-12-01(&|$)/);
		await expect(page).toHaveURL(/[?&]to=2026-12-04(&|$)/);
		// Back from the server, the days are shown in the shop's style again.
		await expect(from).toHaveValue('12/1/2026');
		await expect(to).toHaveValue('12/4/2026');
		await expect(page.getByTestId('date-field-error')).toHaveCount(0);
	} finally {
		await db()`update shop set locale = ${shop.locale} where id = ${shop.id}`;
	}
});

test('the evidence pack streams a whole PDF', async ({ page }) => {
	await signIn(page, demo.owner);
	const res = await page.request.get('/jobs/1046/evidence/pdf');
	expect(res.status()).toBe(200);
	expect(res.headers()['content-type']).toBe('application/pdf');
	const pdf = await res.body();
	expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
	const dir = mkdtempSync(join(tmpdir(), 'evidence-e2e-'));
	writeFileSync(join(dir, 'pack.pdf'), pdf);
	const text = spawnSync('pdftotext', [join(dir, 'pack.pdf'), '-'], { encoding: 'utf8' });
	expect(text.status).toBe(0);
	expect(text.stdout).toContain('Evidence pack, job card 1046');
});
