// Technicians of the test's own, each with a job in work (the demo periodic service), added to
// the demo shop: a test that writes to their job logs never meets another test's entries.
import type { Page } from '@playwright/test';
import { makeCrew, type CrewMember } from '../../scripts/lib/harness';
import { demoPassword, signIn } from './auth';

export const tag = () => Math.random().toString(36).slice(2, 8);

export async function crew(technicians: number): Promise<CrewMember[]> {
	const url = process.env.BENCHCALL_TEST_DATABASE_URL;
	if (!url) throw new Error('BENCHCALL_TEST_DATABASE_URL is not set (run through npm test).');
	const firstJob = 60_000 + Math.floor(Math.random() * 30_000) * 3;
	const c = await makeCrew(url, { technicians, foremen: 0, prefix: `t-${tag()}`, firstJob });
	return c.technicians;
}

/** Signs a crew member in through the form; `base` for a server other than the configured one. */
export function signInAs(page: Page, who: { email: string }, base = '') {
	return signIn(page, who.email, demoPassword, base);
}
