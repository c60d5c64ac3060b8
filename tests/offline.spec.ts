// The Bench without a network: the service worker's offline shell, the outbox across a reload,
// entries stored exactly once, bad input (a job since reassigned, a signed-out or different
// account) and a new deploy picked up on the next online load. Each test works on jobs of its
// own technicians (added to the demo shop), so no other test's job log moves under it.
import { cpSync, existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { expect, test, type BrowserContext, type Page } from '@playwright/test';
import { startApp, stopApp } from '../scripts/lib/harness';
import { db } from './helpers/bench-db';
import { crew, signInAs, tag } from './helpers/crew';
import { layoutProblems } from './helpers/geometry';

const root = fileURLToPath(new URL('..', import.meta.url));

/** Opens the Bench once the service worker is in charge of the page (so it keeps it). */
async function openBench(page: Page, job: number, base = '') {
	await page.goto(`${base}/bench?job=${job}`);
	await page.evaluate(async () => {
		await navigator.serviceWorker.ready;
	});
	// the first load ran before the worker took over; this one passes through it and is kept
	await page.reload();
	await expect(page.getByRole('heading', { name: new RegExp(`Job ${job}`) })).toBeVisible();
	expect(await page.evaluate(() => navigator.serviceWorker.controller !== null)).toBe(true);
}

async function callOut(page: Page, texts: string[]) {
	const bar = page.getByRole('combobox', { name: 'Call bar' });
	for (const text of texts) {
		await bar.fill(text);
		await expect(page.getByTestId('candidate').first()).toBeVisible();
		await page.keyboard.press('Enter');
		await expect(bar).toHaveValue('');
	}
}

/** Two technicians; the first opens the Bench, loses the network and calls out `texts`. */
async function typedOffline(page: Page, context: BrowserContext, texts: string[]) {
	const [tech, other] = await crew(2);
	await signInAs(page, tech);
	await openBench(page, tech.jobNumber);
	await context.setOffline(true);
	await callOut(page, texts);
	return [tech, other] as const;
}

async function stored(text: string) {
	return db()`select e.author_id, e.occurred_at, e.recorded_at from log_entry e
		where e.raw_text = ${text}`;
}

/** The Bench's outbox tries again now (it does so by itself on the browser's `online` event). */
const nudge = (page: Page) => page.evaluate(() => window.dispatchEvent(new Event('online')));

test('the Bench opens offline, keeps what is typed and stores each entry once when back', async ({
	page,
	context
}) => {
	const [tech] = await crew(1);
	await signInAs(page, tech);
	await openBench(page, tech.jobNumber);
	// typed after the page was kept: the offline reload still shows it (the job log as last seen)
	const t = tag();
	await callOut(page, [`note before the network went ${t}`]);
	await expect(page.getByTestId('log-entry').filter({ hasText: t })).toHaveCount(1);
	const nextStep = (await page.getByTestId('next-step').textContent()) ?? '';
	const seen = await page.getByTestId('log-entry').count();

	await context.setOffline(true);
	await page.reload();
	await expect(
		page.getByRole('heading', { name: new RegExp(`Job ${tech.jobNumber}`) })
	).toBeVisible();
	await expect(page.getByTestId('next-step')).toHaveText(nextStep);
	await expect(page.getByTestId('log-entry')).toHaveCount(seen);
	await expect(page.getByTestId('log-entry').filter({ hasText: t })).toHaveCount(1);
	await expect(page.getByTestId('offline-status')).toContainText('No connection');

	const texts = [`note offline one ${t}`, `note offline two ${t}`, `note offline three ${t}`];
	await callOut(page, texts);
	await expect(page.getByTestId('waiting')).toHaveText(/3 waiting/);
	await expect(page.getByTestId('waiting-entry')).toHaveCount(3);

	// a page that needs the server says so, plainly
	const other = await context.newPage();
	await other.goto('/jobs');
	await expect(other.getByTestId('offline-notice')).toContainText('needs the server');
	await other.close();

	// still there after another offline reload: the outbox is on the device, not in the page
	await page.reload();
	await expect(page.getByTestId('waiting-entry')).toHaveCount(3);

	await context.setOffline(false);
	await expect(page.getByTestId('waiting-entry')).toHaveCount(0, { timeout: 20_000 });
	await expect(page.getByTestId('offline-status')).toHaveCount(0);
	for (const text of texts) {
		await expect(page.getByTestId('log-entry').filter({ hasText: text })).toHaveCount(1);
	}

	// stored exactly once each, checked through the API
	const res = await page.request.get(`/api/jobs/${tech.jobId}/entries?after=0&limit=200`);
	expect(res.ok()).toBe(true);
	const body = (await res.json()) as {
		entries: { rawText: string; occurredAt: string; recordedAt: string; authorName: string }[];
	};
	for (const text of texts) {
		expect(body.entries.filter((e) => e.rawText === text)).toHaveLength(1);
	}
	// each keeps the time it was typed, before the server had it, in the order typed
	const rows = texts.map((x) => body.entries.find((e) => e.rawText === x)!);
	for (const e of rows) {
		expect(e.authorName).toBe(tech.name);
		expect(Date.parse(e.occurredAt)).toBeLessThan(Date.parse(e.recordedAt));
	}
	expect(Date.parse(rows[0].occurredAt)).toBeLessThanOrEqual(Date.parse(rows[1].occurredAt));
	expect(Date.parse(rows[1].occurredAt)).toBeLessThanOrEqual(Date.parse(rows[2].occurredAt));
});

test('an entry for a job since given to someone else is refused, kept and shown with the reason', async ({
	page,
	context
}) => {
	const text = `note reassigned meanwhile ${tag()}`;
	const mistake = `note typed by mistake ${tag()}`;
	const [tech, other] = await typedOffline(page, context, [text, mistake]);
	await expect(page.getByTestId('waiting-entry')).toHaveCount(2);

	// the foreman gives the job to another technician while this tablet is offline
	await db()`update job set technician_id = ${other.id} where id = ${tech.jobId}`;
	await context.setOffline(false);
	const refused = page.getByTestId('refused-entry').filter({ hasText: text });
	await expect(page.getByTestId('refused-entry')).toHaveCount(2, { timeout: 20_000 });
	await expect(refused.getByTestId('refused-reason')).toContainText('not assigned to you');
	expect(await stored(text)).toHaveLength(0);
	expect(await stored(mistake)).toHaveLength(0);
	expect(await layoutProblems(page)).toEqual([]);

	// kept on the device: a reload (the job is no longer on this bench) still shows it
	await page.goto('/bench');
	await expect(refused).toContainText(`Job ${tech.jobNumber}`);

	// removed only by hand, after a question: saying no keeps it
	const wrong = page.getByTestId('refused-entry').filter({ hasText: mistake });
	page.once('dialog', (d) => void d.dismiss());
	await wrong.getByRole('button', { name: 'Remove from this device' }).click();
	await expect(wrong).toHaveCount(1);
	page.once('dialog', (d) => void d.accept());
	await wrong.getByRole('button', { name: 'Remove from this device' }).click();
	await expect(wrong).toHaveCount(0);

	// given back: sent again with its own id and time, stored once under its author's name
	await db()`update job set technician_id = ${tech.id} where id = ${tech.jobId}`;
	await refused.getByRole('button', { name: 'Send again' }).click();
	await expect(page.getByTestId('refused-entry')).toHaveCount(0);
	await expect.poll(async () => (await stored(text)).length, { timeout: 20_000 }).toBe(1);
	const rows = await stored(text);
	expect(rows).toHaveLength(1);
	expect(rows[0].author_id).toBe(tech.id);
	expect(await stored(mistake)).toHaveLength(0);
});

test('a signed-out outbox waits, and never sends under the account signed in next', async ({
	page,
	context
}) => {
	const text = `note typed before sign-out ${tag()}`;
	const [tech, other] = await typedOffline(page, context, [text]);

	// the session ends while the tablet is offline
	await context.clearCookies();
	await context.setOffline(false);
	const held = page.getByTestId('outbox-held');
	await expect(held).toContainText('Signed out', { timeout: 20_000 });
	await expect(held.getByRole('link', { name: 'Sign in again' })).toBeVisible();
	expect(await layoutProblems(page)).toEqual([]);
	expect(await stored(text)).toHaveLength(0);

	// someone else signs in on this device (another tab): the entry is not theirs to send
	const second = await context.newPage();
	await signInAs(second, other);
	await nudge(page);
	await expect(held).toContainText('another account', { timeout: 20_000 });
	await expect(page.getByTestId('waiting-entry')).toHaveCount(1);
	expect(await stored(text)).toHaveLength(0);

	// its author signs in again: stored once, under the author's name
	await context.clearCookies();
	await signInAs(second, tech);
	await nudge(page);
	await expect(page.getByTestId('waiting-entry')).toHaveCount(0, { timeout: 20_000 });
	const rows = await stored(text);
	expect(rows).toHaveLength(1);
	expect(rows[0].author_id).toBe(tech.id);
	await expect(held).toHaveCount(0);
});

// A new deploy without a second build: the same build is served from a copy whose service
// worker names another version (as a rebuild would), on a server of its own on one port, so the
// browser sees one origin whose worker changed between two loads.
test('a new deploy is picked up on the next online load; the voice model stays cached', async ({
	browser
}) => {
	test.setTimeout(180_000);
	const [tech] = await crew(1);
	const port = Number(process.env.BENCHCALL_TEST_PORT ?? 4173) + 22;
	const base = `http://127.0.0.1:${port}`;
	const databaseUrl = process.env.BENCHCALL_TEST_DATABASE_URL ?? '';
	const dir = join(root, '.data', 'sw-update');
	mkdirSync(dir, { recursive: true });
	const logFile = join(dir, 'app.log');
	const before = JSON.parse(readFileSync(join(root, 'build/client/_app/version.json'), 'utf8'))
		.version as string;
	const after = `${before}-next`;

	const copy = join(dir, 'build');
	rmSync(copy, { recursive: true, force: true });
	cpSync(join(root, 'build'), copy, { recursive: true });
	const swFile = join(copy, 'client/service-worker.js');
	const sw = readFileSync(swFile, 'utf8');
	expect(sw).toContain(before);
	writeFileSync(swFile, sw.replaceAll(before, after));
	// the precompressed copies would still be the old worker
	for (const ext of ['.br', '.gz']) rmSync(swFile + ext, { force: true });
	expect(existsSync(swFile + '.br')).toBe(false);

	const context = await browser.newContext({ baseURL: base });
	const page = await context.newPage();
	// a question sent to a worker that is just being replaced gets no answer: give up after 2 s
	// and let the poll ask again, rather than wait on it past the poll's own timeout
	const version = () =>
		page.evaluate(
			() =>
				new Promise<string>((resolve) => {
					const timer = setTimeout(() => resolve('no answer'), 2_000);
					navigator.serviceWorker.addEventListener(
						'message',
						(e) => {
							clearTimeout(timer);
							resolve(e.data.version);
						},
						{ once: true }
					);
					navigator.serviceWorker.controller?.postMessage('version');
				})
		);
	const cacheNames = () => page.evaluate(() => caches.keys());
	const workers = () =>
		page.evaluate(async () => {
			const r = await navigator.serviceWorker.getRegistration();
			const v = (w: ServiceWorker | null | undefined) => w?.state ?? '-';
			return {
				busy: Boolean(r?.installing ?? r?.waiting),
				text: `installing ${v(r?.installing)}, waiting ${v(r?.waiting)}, active ${v(r?.active)}`
			};
		});

	let app = await startApp({ port, databaseUrl, logFile });
	try {
		await signInAs(page, tech, base);
		await openBench(page, tech.jobNumber, base);
		expect(await version()).toBe(before);
		// stands in for a voice model file fetched when voice was switched on
		await page.evaluate(async () => {
			const cache = await caches.open('benchcall-voice-model');
			await cache.put('/voice-model/probe', new Response('model'));
		});
		expect(await cacheNames()).toContain(`benchcall-app-${before}`);
		await stopApp(app);

		app = await startApp({ port, databaseUrl, logFile, dir: copy });
		// The new worker installs (precaching the build into a cache of its own), then takes over
		// once the old one is idle, deleting the old build's cache: slow on a loaded machine.
		// Meanwhile nothing is asked of the old worker (a question is work that holds the
		// handover back); the technician loads the page again every 20 s. What the browser
		// reported goes into the message.
		const [oldCache, newCache] = [before, after].map((v) => `benchcall-app-${v}`);
		const seen: string[] = [];
		let loaded = 0;
		for (const until = Date.now() + 90_000; Date.now() < until; await page.waitForTimeout(1_000)) {
			if (Date.now() - loaded > 20_000) {
				await page.goto(`${base}/bench?job=${tech.jobNumber}`);
				loaded = Date.now();
			}
			const names = await cacheNames();
			if (names.includes(newCache) && !names.includes(oldCache)) break;
			const state = await workers();
			if (seen.at(-1) !== state.text) seen.push(state.text);
		}
		const log = readFileSync(logFile, 'utf8').slice(-1_000);
		expect(await cacheNames(), `worker states: ${seen.join(' → ')}\napp log: ${log}`).not.toContain(
			oldCache
		);
		await expect.poll(version, { timeout: 10_000 }).toBe(after);
		expect(await cacheNames()).toContain(`benchcall-app-${after}`);
		expect(
			await page.evaluate(async () => {
				const hit = await caches.match('/voice-model/probe');
				return hit ? hit.text() : null;
			})
		).toBe('model');

		// the new worker keeps the Bench for offline use too
		await page.reload();
		await context.setOffline(true);
		await page.reload();
		await expect(
			page.getByRole('heading', { name: new RegExp(`Job ${tech.jobNumber}`) })
		).toBeVisible();
	} finally {
		await context.close();
		await stopApp(app);
	}
});
