// The Bench's page helpers for end-to-end tests: the call bar, and a job opened on it.
import { expect, type Page } from '@playwright/test';
import { signIn } from './auth';

export const callBar = (page: Page) => page.getByRole('combobox', { name: 'Call bar' });

/** Signs in and opens the job on the Bench, ready to call out (the bar has the focus). */
export async function openBench(page: Page, email: string, number: number) {
	await signIn(page, email);
	await page.goto(`/bench?job=${number}`);
	await expect(page.getByRole('heading', { name: new RegExp(`Job ${number}`) })).toBeVisible();
	await expect(callBar(page)).toBeFocused();
}

/** Types a phrase into the call bar and waits for its preview. */
export async function call(page: Page, text: string) {
	await callBar(page).fill(text);
	await expect(page.getByTestId('candidate').first()).toBeVisible();
}
