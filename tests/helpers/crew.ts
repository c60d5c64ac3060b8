// Technicians of the test's own, each with a job in work (the demo periodic service), added to
// the demo shop: a test that writes to their job logs never meets another test's entries.
import { expect, type Page } from '@playwright/test';
import { makeCrew, type CrewMember } from '../../scripts/lib/harness';
import { demoPassword } from './auth';

export const tag = () => Math.random().toString(36).slice(2, 8);

export async function crew(technicians: number): Promise<CrewMember[]> {
	const url = process.env.BENCHCALL_TEST_DATABASE_URL;
	if (!url) throw new Error('BENCHCALL_TEST_DATABASE_URL is not set (run through npm test).');
	const firstJob = 60_000 + Math.floor(Math.random() * 30_000) * 3;
	const c = await makeCrew(url, { technicians, foremen: 0, prefix: `t-${tag()}`, firstJob });
	return c.technicians;
}

/** Signs in through the form; `base` for a server other than the configured one. */
export async function signInAs(page: Page, who: { email: string }, base = '') {
	await page.goto(`${base}/sign-in`);
	await page.getByLabel('E-mail').fill(who.email);
	await page.getByLabel('Password').fill(demoPassword);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page).not.toHaveURL(/\/sign-in/, { timeout: 15_000 });
}
