import { expect, test, type Page } from '@playwright/test';
import { demo } from './helpers/auth';
import { db, entry } from './helpers/bench-db';
import { callBar as bar, openBench } from './helpers/bench';

const rows = (page: Page) => page.getByTestId('log-entry');

test('the Bench previews the oil grade against the step spec and keeps it with the entry', async ({
	page
}) => {
	await openBench(page, demo.tomasz, 1041);

	// demo spec "SAE 10W-40, API SL or higher, JASO MA2": no grade said → the preview asks for it
	await bar(page).fill('engine oil 1.1 l');
	const top = page.getByTestId('candidate').first();
	await expect(top.locator('[data-grade-verdict="not_stated"]')).toBeVisible();

	// JASO T 903: MB never meets MA2, and the wet-clutch caution shows; the quantity stays in spec
	await bar(page).fill('engine oil 10w-40 jaso mb 1.1 l');
	await expect(top.locator('[data-grade-verdict="fails"]')).toContainText('SAE 10W-40 · JASO MB');
	await expect(top.getByTestId('preview-grade-caution')).toContainText('wet clutch');
	await expect(top.locator('[data-verdict="in"]')).toBeVisible();
	const before = await rows(page).count();
	await page.keyboard.press('Enter');
	await expect(rows(page)).toHaveCount(before + 1);
	const first = rows(page).first();
	await expect(first.locator('[data-grade-verdict="fails"]')).toBeVisible();
	const stored = await entry((await first.getAttribute('data-entry-id'))!);
	expect(stored).toMatchObject({ fluid: 'SAE 10W-40 · JASO MB', fluid_verdict: 'fails' });

	// an unknown grade is a clear problem in the preview, never a crash
	await bar(page).fill('engine oil 15w-35 1.1 l');
	await expect(top.locator('[data-grade-verdict="fails"]')).toBeVisible();
	await expect(top).toContainText('15W-35 is not an SAE J300 grade');

	// take the wrong fill back so the demo job's Floor queue stays as seeded
	await bar(page).fill('undo');
	await page.keyboard.press('Enter');
	// the retraction is the newest row now: find the fill by its id
	await expect(page.locator(`[data-entry-id="${stored!.id}"]`)).toHaveAttribute(
		'data-retracted',
		'yes'
	);
	const [r] = await db()`select count(*)::int as n from log_entry where retracts = ${stored!.id}`;
	expect(r.n).toBe(1);
});
