import { expect, test } from '@playwright/test';
import { demo, signIn } from './helpers/auth';

test.describe('sign-in lands each role on its home', () => {
	const cases = [
		{ email: demo.tomasz, home: '/bench', heading: /^Job 1042/, role: 'Technician' },
		{ email: demo.foreman, home: '/floor', heading: 'Floor', role: 'Foreman' },
		{ email: demo.writer, home: '/jobs', heading: 'Job cards', role: 'Service writer' },
		{ email: demo.owner, home: '/jobs', heading: 'Job cards', role: 'Owner' }
	];
	for (const c of cases) {
		test(`${c.role} → ${c.home}`, async ({ page }) => {
			await signIn(page, c.email);
			await expect(page).toHaveURL(c.home);
			await expect(page.getByRole('heading', { level: 1 })).toHaveText(c.heading);
			await expect(page.getByTestId('user-role')).toHaveText(c.role);
			await expect(page.getByRole('link', { name: 'Read the notice' })).toBeVisible();
		});
	}
});

test('a technician sees their own jobs only', async ({ page }) => {
	await signIn(page, demo.tomasz);
	const picker = page.getByRole('navigation', { name: 'Your jobs' });
	await expect(picker.getByRole('link', { name: /^1042/ })).toBeVisible();
	await expect(picker.getByRole('link', { name: /^1043/ })).toHaveCount(0);
});

test('a technician is refused on owner pages and API routes', async ({ page }) => {
	await signIn(page, demo.tomasz);
	const res = await page.goto('/shop');
	expect(res?.status()).toBe(403);
	await expect(page.getByRole('heading', { name: 'Not open to your role' })).toBeVisible();
	const api = await page.request.get('/api/staff');
	expect(api.status()).toBe(403);
	const floor = await page.goto('/floor');
	expect(floor?.status()).toBe(403);
});

test('an owner reads the staff API of their own shop only', async ({ page }) => {
	await signIn(page, demo.owner);
	const res = await page.request.get('/api/staff');
	expect(res.status()).toBe(200);
	const body = await res.json();
	const emails = body.staff.map((s: { email: string }) => s.email);
	expect(emails).toContain(demo.tomasz);
	expect(emails).not.toContain(demo.otherTech);
});

test('signed out, pages redirect to sign-in and the API answers 401', async ({ page }) => {
	await page.goto('/jobs');
	await expect(page).toHaveURL(/\/sign-in\?next=%2Fjobs/);
	const api = await page.request.get('/api/staff');
	expect(api.status()).toBe(401);
});

test('sign-out ends the session', async ({ page, context }) => {
	await signIn(page, demo.writer);
	const cookie = (await context.cookies()).find((c) => c.name === 'benchcall_session');
	expect(cookie?.httpOnly).toBe(true);
	expect(cookie?.sameSite).toBe('Lax');
	await page.getByRole('button', { name: 'Sign out' }).last().click();
	await expect(page).toHaveURL('/sign-in');
	// The old cookie, replayed, opens nothing.
	await context.addCookies([{ ...cookie!, expires: -1 }]);
	await page.goto('/jobs');
	await expect(page).toHaveURL(/\/sign-in/);
});

test('a wrong password shows one generic message', async ({ page }) => {
	await page.goto('/sign-in');
	await page.getByLabel('E-mail').fill(demo.ruth);
	await page.getByLabel('Password').fill('not-the-password');
	await page.getByRole('button', { name: 'Sign in' }).click();
	const alert = page.getByRole('alert');
	await expect(alert).toHaveText('That e-mail and password do not match an active account.');
	// An unknown e-mail gets the very same words.
	await page.getByLabel('E-mail').fill('nobody@kettlestreet.test');
	await page.getByLabel('Password').fill('whatever');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(alert).toHaveText('That e-mail and password do not match an active account.');
	await expect(page.getByLabel('E-mail')).toHaveValue('nobody@kettlestreet.test');
});

test('a 10 kB e-mail or an empty form gives a form error, never a 500', async ({ page }) => {
	await page.goto('/sign-in');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByText('Enter your e-mail address.')).toBeVisible();
	await expect(page.getByText('Enter your password.')).toBeVisible();

	await page.getByLabel('E-mail').fill('a'.repeat(10_000) + '@x.test');
	await page.getByLabel('Password').fill('x');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByText('An e-mail address is at most 254 characters.')).toBeVisible();

	const raw = await page.request.post('/sign-in', {
		form: { email: 'b'.repeat(10_000), password: '' },
		headers: { origin: new URL(page.url()).origin, accept: 'application/json' }
	});
	expect(raw.status()).toBeLessThan(500);
});

test('repeated failures pause sign-in for that e-mail and say so', async ({ page }) => {
	test.setTimeout(60_000);
	const email = 'ruth@kettlestreet.test'.replace('ruth', 'nobody-throttle');
	await page.goto('/sign-in');
	for (let i = 0; i < 5; i++) {
		await page.getByLabel('E-mail').fill(email);
		await page.getByLabel('Password').fill(`wrong-${i}`);
		// Wait for each answer: from the third failure on, answers are slowed down.
		const answered = page.waitForResponse(
			(r) => r.url().includes('/sign-in') && r.request().method() === 'POST'
		);
		await page.getByRole('button', { name: 'Sign in' }).click();
		await answered;
		await expect(page.getByRole('alert')).toBeVisible();
	}
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill('wrong-again');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByRole('alert')).toContainText('Sign-in is paused for it');
});

test('an owner adds a technician, who signs in; deactivation ends their session at once', async ({
	browser
}) => {
	const ownerCtx = await browser.newContext();
	const owner = await ownerCtx.newPage();
	await signIn(owner, demo.owner);
	await owner.goto('/shop');
	const email = `new-tech-${Date.now()}@kettlestreet.test`;
	const form = owner.locator('form[action="?/create"]');
	await form.getByLabel('Name').fill('Noor Haddad-Winter');
	await form.getByLabel('E-mail').fill(email);
	await form.getByLabel('Role').selectOption('technician');
	await form.getByLabel('First password').fill('first-pass-123');
	await form.getByRole('button', { name: 'Add account' }).click();
	await expect(owner.getByRole('status')).toHaveText('Account for Noor Haddad-Winter created.');

	const techCtx = await browser.newContext();
	const tech = await techCtx.newPage();
	await signIn(tech, email, 'first-pass-123');
	await expect(tech).toHaveURL('/bench');

	const row = owner.getByRole('row', { name: /Noor Haddad-Winter/ });
	await row.getByRole('button', { name: 'Deactivate' }).click();
	await expect(owner.getByRole('status')).toContainText('deactivated');

	await tech.goto('/bench');
	await expect(tech).toHaveURL(/\/sign-in/);
	await ownerCtx.close();
	await techCtx.close();
});
