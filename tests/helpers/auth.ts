import { expect, type Page } from '@playwright/test';
import { demoPassword } from '../../scripts/lib/demo.js';

export const demo = {
	owner: 'owner@kettlestreet.test',
	writer: 'desk@kettlestreet.test',
	foreman: 'foreman@kettlestreet.test',
	tomasz: 'tomasz@kettlestreet.test',
	ruth: 'ruth@kettlestreet.test',
	otherOwner: 'owner@harbourlane.test',
	otherTech: 'tech@harbourlane.test'
} as const;

export { demoPassword };

/**
 * Signs in through the form, as a person would, and waits for the landing page; `base` for a
 * server other than the configured one.
 */
export async function signIn(page: Page, email: string, password = demoPassword, base = '') {
	await page.goto(`${base}/sign-in`);
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	// Generous: argon2 verification is slow when the machine is busy.
	await expect(page).not.toHaveURL(/\/sign-in/, { timeout: 15_000 });
}
