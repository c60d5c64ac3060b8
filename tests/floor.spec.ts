import { expect, test, type APIRequestContext, type Browser } from '@playwright/test';
import { spawn, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { demo, signIn } from './helpers/auth';
import { jobRow, makeFloorJob, setJobState } from './helpers/floor-db';

const port = Number(process.env.BENCHCALL_TEST_PORT ?? 4173);
const origin = `http://127.0.0.1:${port}`;

/** A signed-in browser context for `email` (its request shares the session cookie). */
async function as(browser: Browser, email: string, baseURL = origin) {
	const context = await browser.newContext({ baseURL });
	const page = await context.newPage();
	await signIn(page, email);
	return { context, page, request: page.request };
}

async function callOut(request: APIRequestContext, jobId: string, text: string) {
	const res = await request.post(`/api/jobs/${jobId}/entries`, {
		data: { id: crypto.randomUUID(), text, source: 'typed' }
	});
	expect(res.status(), await res.text()).toBe(201);
	return ((await res.json()) as { entry: { id: string } }).entry.id;
}

test('an out-of-spec value reaches the Floor live; a redo reaches the Bench; a new value clears it', async ({
	browser
}) => {
	const job = await makeFloorJob();
	const foreman = await as(browser, demo.foreman);
	const tech = await as(browser, demo.tomasz);

	await foreman.page.goto('/floor');
	await expect(foreman.page.getByTestId('connection')).toHaveAttribute('data-state', 'live');
	// The technician has the job open on the Bench the whole time, never reloading it.
	await tech.page.goto(`/bench?job=${job.number}`);
	const banner = tech.page.getByTestId('redo-banner');
	await expect(tech.page.getByTestId('live-state')).toHaveAttribute('data-state', 'live');

	await callOut(tech.request, job.id, 'rear axle 120 nm');
	// Without a reload, within 2 s: in the running log and in the out-of-spec queue.
	const item = foreman.page.getByTestId('oos-item').filter({ hasText: `#${job.number}` });
	await expect(item).toBeVisible({ timeout: 2_000 });
	await expect(item).toContainText('Rear axle nut');
	await expect(item).toContainText('over');
	await expect(
		foreman.page
			.getByTestId('log-entry')
			.filter({ hasText: `#${job.number}` })
			.first()
	).toContainText('120');

	// Keyboard: select the item, r for redo, type the note, Enter.
	await item.getByRole('button').first().click();
	await foreman.page.keyboard.press('r');
	await foreman.page.getByLabel('What the technician should redo').fill('Slacken and torque again');
	await foreman.page.keyboard.press('Enter');
	await expect(item).toHaveCount(0);

	// The redo reaches the open Bench without a reload.
	await expect(banner).toContainText('Rear axle nut', { timeout: 2_000 });
	await expect(banner).toContainText('Slacken and torque again');

	// A value out of spec again is a new item; an in-spec one clears the queue and the redo.
	await callOut(tech.request, job.id, 'rear axle 70 nm');
	await expect(item).toContainText('under', { timeout: 2_000 });
	await callOut(tech.request, job.id, 'rear axle 88 nm');
	await expect(item).toHaveCount(0, { timeout: 2_000 });
	await expect(banner).toHaveCount(0, { timeout: 2_000 });
	await tech.page.reload();
	await expect(tech.page.getByTestId('redo-banner')).toHaveCount(0);

	await foreman.context.close();
	await tech.context.close();
});

test('final inspection: ready to invoice is refused before sign-off; checklist, sign-off, then ready', async ({
	browser
}) => {
	const job = await makeFloorJob();
	const foreman = await as(browser, demo.foreman);
	const tech = await as(browser, demo.tomasz);
	const over = await callOut(tech.request, job.id, 'rear axle 99 nm');
	await setJobState(job.id, 'final_inspection');

	const refused = await foreman.request.post(`/api/floor/jobs/${job.id}/ready`);
	expect(refused.status()).toBe(409);
	expect(((await refused.json()) as { message: string }).message).toMatch(/no sign-off/);

	const accepted = await foreman.request.post(`/api/floor/entries/${over}/accept`, {
		data: { reason: 'Checked with a second wrench: nut seated, within wheel practice' }
	});
	expect(accepted.status()).toBe(201);

	await foreman.page.goto(`/floor/jobs/${job.id}`);
	const boxes = foreman.page.getByRole('checkbox');
	const count = await boxes.count();
	expect(count).toBeGreaterThan(0);
	for (let i = 0; i < count; i++) {
		await boxes.nth(i).check();
		await expect(boxes.nth(i)).toBeChecked();
		await expect(boxes.nth(i)).toBeEnabled();
	}
	await foreman.page.getByRole('button', { name: 'Sign off' }).click();
	await expect(foreman.page.getByTestId('signed-off')).toContainText('Signed off by');
	const signed = await jobRow(job.id);
	expect(signed.signed_off_at).not.toBeNull();

	await foreman.page.getByRole('button', { name: 'Ready to invoice' }).click();
	await expect(foreman.page.getByText('Moved to ready to invoice.')).toBeVisible();
	expect((await jobRow(job.id)).state).toBe('ready_to_invoice');

	await foreman.context.close();
	await tech.context.close();
});

test('the owner edits the final-inspection checklist; the foreman ticks what the shop asks for', async ({
	browser
}) => {
	const job = await makeFloorJob();
	await setJobState(job.id, 'final_inspection');
	const owner = await as(browser, demo.owner);
	const label = `Mirrors set ${crypto.randomUUID().slice(0, 6)}`;

	await owner.page.goto('/shop/settings');
	const lines = owner.page.getByRole('list', { name: 'Checklist lines' });
	await lines.getByLabel('New checklist line').fill(label);
	await lines.getByRole('button', { name: 'Add line' }).click();
	await expect(owner.page.getByRole('status')).toContainText(`"${label}" added`);
	await expect(lines.getByRole('textbox').last()).toHaveValue(''); // the add row is empty again

	// A second line with the same words is refused with a message, and what was typed stays.
	await lines.getByLabel('New checklist line').fill(label.toUpperCase());
	await lines.getByRole('button', { name: 'Add line' }).click();
	await expect(lines.getByText('is on the list already')).toBeVisible();
	await expect(lines.getByLabel('New checklist line')).toHaveValue(label.toUpperCase());

	// Move it up one place: it now sits above the line that was before it.
	const before = await lines
		.getByRole('textbox')
		.evaluateAll((els) => els.map((e) => (e as HTMLInputElement).value));
	const at = before.indexOf(label);
	await lines.getByRole('button', { name: `Move “${label}” up` }).click();
	await expect(lines.getByRole('textbox').nth(at - 1)).toHaveValue(label);

	const foreman = await as(browser, demo.foreman);
	await foreman.page.goto(`/floor/jobs/${job.id}`);
	await expect(foreman.page.getByRole('checkbox', { name: label })).toBeVisible();

	// Technicians cannot change the checklist.
	const tech = await as(browser, demo.tomasz);
	const refused = await tech.request.post('/shop/settings?/checkItem', {
		form: { itemId: '', label: 'Skip the test ride' },
		headers: { origin }
	});
	expect(refused.status()).toBe(403);

	await owner.context.close();
	await foreman.context.close();
	await tech.context.close();
});

test('technicians and service writers cannot accept, order a redo or sign off (403)', async ({
	browser
}) => {
	const job = await makeFloorJob();
	const tech = await as(browser, demo.tomasz);
	const over = await callOut(tech.request, job.id, 'rear axle 130 nm');
	const writer = await as(browser, demo.writer);
	for (const who of [tech, writer]) {
		const accept = await who.request.post(`/api/floor/entries/${over}/accept`, {
			data: { reason: 'looks fine to me' }
		});
		expect(accept.status()).toBe(403);
		const redo = await who.request.post(`/api/floor/entries/${over}/redo`, {
			data: { note: 'again' }
		});
		expect(redo.status()).toBe(403);
		expect((await who.request.post(`/api/floor/jobs/${job.id}/sign-off`)).status()).toBe(403);
		expect((await who.request.get('/api/floor/stream')).status()).toBe(403);
	}
	await tech.context.close();
	await writer.context.close();
});

test.describe('two server processes', () => {
	const port2 = port + 10;
	const origin2 = `http://127.0.0.1:${port2}`;
	let server: ChildProcess | null = null;

	test.beforeAll(async () => {
		const root = fileURLToPath(new URL('..', import.meta.url));
		server = spawn('node', ['build'], {
			cwd: root,
			env: {
				...process.env,
				HOST: '127.0.0.1',
				PORT: String(port2),
				ORIGIN: origin2,
				DATABASE_URL: process.env.BENCHCALL_TEST_DATABASE_URL ?? ''
			},
			stdio: 'ignore'
		});
		for (let i = 0; i < 100; i++) {
			try {
				if ((await fetch(`${origin2}/sign-in`)).ok) return;
			} catch {
				// not up yet
			}
			await new Promise((r) => setTimeout(r, 200));
		}
		throw new Error(`the second server did not start on ${origin2}`);
	});

	test.afterAll(() => {
		server?.kill('SIGTERM');
	});

	test('an entry posted to one server shows on a browser connected to the other', async ({
		browser
	}) => {
		const job = await makeFloorJob();
		const foreman = await as(browser, demo.foreman, origin2);
		const tech = await as(browser, demo.tomasz, origin);
		await foreman.page.goto('/floor');
		await expect(foreman.page.getByTestId('connection')).toHaveAttribute('data-state', 'live');
		await callOut(tech.request, job.id, 'rear axle 140 nm');
		await expect(
			foreman.page.getByTestId('log-entry').filter({ hasText: `#${job.number}` })
		).toContainText('140', { timeout: 2_000 });
		await foreman.context.close();
		await tech.context.close();
	});
});
