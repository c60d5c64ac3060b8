import { expect, test, type Page } from '@playwright/test';
import { demo, signIn } from './helpers/auth';
import { db, entry, jobId } from './helpers/bench-db';
import { call, callBar as bar, openBench } from './helpers/bench';

const rows = (page: Page) => page.getByTestId('log-entry');
const tag = () => Math.random().toString(36).slice(2, 8);

test.describe('the Bench', () => {
	test('a typed phrase is previewed, logged with Enter and stored with the right verdict', async ({
		page
	}) => {
		await openBench(page, demo.tomasz, 1042);
		// 5.9 kgf·m × 9.80665 = 57.86 N·m (NIST SP 811 B.8), inside the demo band 50–60 N·m
		await call(page, 'lower mount 5.9 kgf m');
		const top = page.getByTestId('candidate').first();
		await expect(top).toContainText('Lower engine mount bolt');
		await expect(top.getByTestId('preview-value')).toHaveText('57.86 N·m');
		await expect(top.locator('[data-verdict="in"]')).toHaveText(/In spec/);
		await expect(top.getByTestId('preview-caution')).toBeVisible();
		const before = await rows(page).count();
		await page.keyboard.press('Enter');
		await expect(rows(page)).toHaveCount(before + 1);
		const first = rows(page).first();
		await expect(first).toContainText('lower mount 5.9 kgf m');
		await expect(first).toHaveAttribute('data-verdict', 'in');
		await expect(bar(page)).toHaveValue('');
		const stored = await entry((await first.getAttribute('data-entry-id'))!);
		expect(stored).toMatchObject({
			kind: 'measure',
			verdict: 'in',
			unit: 'kgf.m',
			spec_unit: 'N.m'
		});
		expect(stored!.spec_value).toBeCloseTo(57.859, 2);

		// an out-of-spec value stands out
		await call(page, 'lower mount 70 nm');
		await page.keyboard.press('Enter');
		await expect(rows(page).first()).toHaveAttribute('data-verdict', 'high');
		await expect(rows(page).first()).toContainText('Over');
	});

	test('arrow keys pick another matching step', async ({ page }) => {
		await openBench(page, demo.tomasz, 1042);
		await call(page, 'engine mount 3.4 kgf m');
		await expect(page.getByTestId('candidate')).toHaveCount(3);
		await page.keyboard.press('ArrowDown');
		const second = page.getByTestId('candidate').nth(1);
		await expect(second).toHaveAttribute('aria-selected', 'true');
		const label = (await second.locator('p').nth(1).innerText()).trim();
		await page.keyboard.press('Enter');
		await expect(rows(page).first()).toContainText(label);
		const stored = await entry((await rows(page).first().getAttribute('data-entry-id'))!);
		const [step] = await db()`select label from job_step where id = ${stored!.job_step_id}`;
		expect(step.label).toBe(label);
	});

	test('"next" and "spec" show a step without logging', async ({ page }) => {
		await openBench(page, demo.tomasz, 1042);
		const before = await rows(page).count();
		await call(page, 'next');
		await page.keyboard.press('Enter');
		const next = (await page.getByTestId('next-step').locator('p').first().innerText()).trim();
		await expect(page.getByTestId('answer')).toContainText(next);
		await call(page, 'spec front mount');
		await page.keyboard.press('Enter');
		await expect(page.getByTestId('answer')).toContainText('Front engine mount bolts');
		await expect(page.getByTestId('answer')).toContainText('3 kgf·m – 3.6 kgf·m');
		await expect(rows(page)).toHaveCount(before);
		await page.keyboard.press('Escape');
		await expect(page.getByTestId('answer')).toHaveCount(0);
	});

	test('"history <step>" shows its past readings on this vehicle without logging', async ({
		page
	}) => {
		// Job 1041's motorcycle has six past paid services with the rear axle nut torqued (seed).
		await openBench(page, demo.tomasz, 1041);
		const before = await rows(page).count();
		await call(page, 'history rear axle');
		await expect(page.getByTestId('candidate').first()).toContainText('Show past readings');
		await page.keyboard.press('Enter');
		const panel = page.getByTestId('step-history');
		await expect(panel).toContainText('Rear axle nut');
		expect(await panel.getByTestId('history-reading').count()).toBeGreaterThanOrEqual(6);
		// newest first: the last past service (job 1021) comes before the first one (job 1001)
		const text = await panel.innerText();
		expect(text.indexOf('1021')).toBeGreaterThan(-1);
		expect(text.indexOf('1021')).toBeLessThan(text.indexOf('1001'));
		await expect(rows(page)).toHaveCount(before);
		await panel.getByRole('button', { name: 'Close' }).click();
		await expect(panel).toHaveCount(0);
	});

	test('undo strikes through your last entry and keeps both in the log', async ({ page }) => {
		await openBench(page, demo.tomasz, 1041);
		const t = tag();
		await call(page, `note undo check ${t}`);
		await page.keyboard.press('Enter');
		const made = rows(page).filter({ hasText: `undo check ${t}` });
		await expect(made).toHaveCount(1);
		const id = (await made.getAttribute('data-entry-id'))!;
		const noted = page.locator(`[data-entry-id="${id}"]`);
		await call(page, 'undo');
		await page.keyboard.press('Enter');
		await expect(noted).toHaveAttribute('data-retracted', 'yes');
		await expect(noted.getByTestId('retracted-by')).toContainText('Tomasz');
		await expect(rows(page).first()).toHaveAttribute('data-kind', 'retraction');
		const [r] = await db()`select count(*)::int as n from log_entry where retracts = ${id}`;
		expect(r.n).toBe(1);
	});

	test('a closed job says so and offers no call bar', async ({ page }) => {
		// job 1001 of the demo shop is paid (seed): its record takes no more entries
		await signIn(page, demo.foreman);
		await page.goto('/bench?job=1001');
		await expect(page.getByRole('heading', { name: /Job 1001/ })).toBeVisible();
		await expect(page.getByTestId('bench-closed')).toContainText('paid');
		await expect(page.getByTestId('bench-closed')).toContainText('no more entries');
		await expect(page.getByTestId('call-bar')).toHaveCount(0);
		await expect(page.getByRole('button', { name: /Start listening/ })).toHaveCount(0);
	});

	test('a photo attaches to an entry; an .exe renamed .jpg is refused', async ({ page }) => {
		await openBench(page, demo.tomasz, 1041);
		await call(page, `note photo ${tag()}`);
		await page.keyboard.press('Enter');
		const first = rows(page).first();
		await expect(first).toHaveAttribute('data-kind', 'note');
		// the smallest valid PNG: 1×1 transparent pixel (PNG specification signature and chunks)
		const png = Buffer.from(
			'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==',
			'base64'
		);
		await first.getByTestId('photo-input').setInputFiles({
			name: 'axle.png',
			mimeType: 'image/png',
			buffer: png
		});
		const thumb = first.getByTestId('photo-thumb');
		await expect(thumb).toBeVisible();
		const src = (await thumb.getAttribute('src'))!;
		const res = await page.request.get(src);
		expect(res.status()).toBe(200);
		// the thumbnail is the downscaled copy; full size shows the original as stored
		expect(res.headers()['content-type']).toBe('image/jpeg');
		await thumb.click();
		const full = page.getByRole('img', { name: 'Attached to the entry, full size' });
		const original = await page.request.get((await full.getAttribute('src'))!);
		expect(original.headers()['content-type']).toBe('image/png');
		const zoom = page.getByRole('dialog', { name: 'Photo full size' });
		await zoom.getByRole('button', { name: 'Close' }).click();
		await expect(zoom).toHaveCount(0);

		// "MZ" starts every Windows program (PE/COFF specification)
		const exe = Buffer.concat([Buffer.from('MZ'), Buffer.alloc(200)]);
		await first.getByTestId('photo-input').setInputFiles({
			name: 'invoice.jpg',
			mimeType: 'image/jpeg',
			buffer: exe
		});
		await expect(first.getByTestId('photo-error')).toContainText('not a JPEG, PNG or WebP');
		await expect(first.getByTestId('photo-thumb')).toHaveCount(1);

		// another shop never sees the photo
		const other = await page.context().browser()!.newContext();
		const p2 = await other.newPage();
		await signIn(p2, demo.otherOwner);
		const base = new URL(page.url()).origin;
		expect((await p2.request.get(base + src)).status()).toBe(404);
		await other.close();
	});

	test('a dictated phrase is logged after the countdown; another is cancelled', async ({
		page
	}) => {
		await page.addInitScript(() => {
			type Handler = ((e: unknown) => void) | null;
			class FakeRecognition {
				lang = '';
				continuous = false;
				interimResults = false;
				onresult: Handler = null;
				onerror: Handler = null;
				onend: (() => void) | null = null;
				start() {
					(window as unknown as { __rec: FakeRecognition }).__rec = this;
				}
				stop() {
					this.onend?.();
				}
				say(text: string, isFinal: boolean) {
					const result = Object.assign([{ transcript: text }], { isFinal });
					this.onresult?.({ resultIndex: 0, results: [result] });
				}
			}
			(window as unknown as Record<string, unknown>).SpeechRecognition = FakeRecognition;
		});
		await openBench(page, demo.tomasz, 1041);
		await page.getByRole('button', { name: /Start listening/ }).click();
		await page.waitForFunction(() => '__rec' in window);
		const say = (text: string, isFinal = true) =>
			page.evaluate(
				([t, f]) =>
					(window as unknown as { __rec: { say: (t: string, f: boolean) => void } }).__rec.say(
						t as string,
						f as boolean
					),
				[text, isFinal] as const
			);
		const t = tag();
		await say('note dictated', false);
		await expect(bar(page)).toHaveValue('note dictated');
		await say(`note dictated ${t}`);
		await expect(page.getByTestId('countdown')).toBeVisible();
		await expect(rows(page).filter({ hasText: `dictated ${t}` })).toHaveCount(0);
		await expect(rows(page).filter({ hasText: `dictated ${t}` })).toHaveCount(1, {
			timeout: 8000
		});
		const id = await rows(page)
			.filter({ hasText: `dictated ${t}` })
			.getAttribute('data-entry-id');
		expect((await entry(id!))!.source).toBe('voice');
		await expect(page.getByTestId('readback')).toContainText('Note logged');

		await say(`note never ${t}`);
		await expect(page.getByTestId('countdown')).toBeVisible();
		await say('cancel');
		await expect(page.getByTestId('bar-message')).toContainText('Cancelled');
		// A phrase said after it goes through the same confirm window and outbox: once it is
		// stored, a cancelled phrase that was logged anyway would be stored too.
		await say(`note after cancel ${t}`);
		await expect(rows(page).filter({ hasText: `after cancel ${t}` })).toHaveCount(1, {
			timeout: 8000
		});
		const [n] =
			await db()`select count(*)::int as n from log_entry where raw_text = ${`note never ${t}`}`;
		expect(n.n).toBe(0);
	});

	test('entries made offline survive a reload and arrive exactly once with their own time', async ({
		page,
		context
	}) => {
		await openBench(page, demo.tomasz, 1041);
		const t = tag();
		await context.setOffline(true);
		const madeAt = Date.now();
		for (const n of [1, 2, 3]) {
			await call(page, `note offline ${n} ${t}`);
			await page.keyboard.press('Enter');
		}
		await expect(page.getByTestId('waiting')).toHaveText(/3 waiting/);
		await expect(page.getByTestId('waiting-entry')).toHaveCount(3);
		// keep the server unreachable across the reload, then let it through
		await page.route('**/api/jobs/*/entries', (route) =>
			route.request().method() === 'POST' ? route.abort() : route.continue()
		);
		// back online, the outbox sends at once; the reload waits until that try has failed
		const tried = page.waitForEvent('requestfailed', (req) => {
			return req.method() === 'POST' && /\/api\/jobs\/[^/]+\/entries$/.test(req.url());
		});
		await context.setOffline(false);
		await tried;
		await page.reload();
		await expect(page.getByTestId('waiting')).toHaveText(/3 waiting/);
		const onlineAt = Date.now();
		await page.unroute('**/api/jobs/*/entries');
		await expect(page.getByTestId('waiting')).toHaveCount(0, { timeout: 20_000 });
		const stored = await db()`
			select raw_text, occurred_at, recorded_at from log_entry
			where raw_text like ${`note offline % ${t}`} order by seq`;
		expect(stored.map((r) => r.raw_text)).toEqual([1, 2, 3].map((n) => `note offline ${n} ${t}`));
		for (const r of stored) {
			const occurred = new Date(r.occurred_at).getTime();
			expect(occurred).toBeGreaterThanOrEqual(madeAt - 1000);
			expect(occurred).toBeLessThan(onlineAt);
			expect(new Date(r.recorded_at).getTime()).toBeGreaterThan(occurred);
		}
		await expect(rows(page).filter({ hasText: `${t}` })).toHaveCount(3);
	});
});

test.describe('the entries API', () => {
	test('repeats are idempotent; bad input 400; not yours 403; another shop 404', async ({
		page,
		browser
	}) => {
		const id1042 = await jobId(1042);
		await signIn(page, demo.tomasz);
		const url = `/api/jobs/${id1042}/entries`;
		const body = { id: crypto.randomUUID(), text: 'lower mount 55 nm', source: 'typed' };
		const first = await page.request.post(url, { data: body });
		expect(first.status()).toBe(201);
		const again = await page.request.post(url, { data: body });
		expect(again.status()).toBe(200);
		expect((await again.json()).entry.id).toBe(body.id);
		const [n] = await db()`select count(*)::int as n from log_entry where id = ${body.id}`;
		expect(n.n).toBe(1);

		const bad = await page.request.post(url, {
			headers: { 'content-type': 'application/json' },
			data: Buffer.from('{"id": oops')
		});
		expect(bad.status()).toBe(400);
		expect((await bad.json()).message).toContain('JSON');
		const noId = await page.request.post(url, { data: { text: 'x', source: 'typed' } });
		expect(noId.status()).toBe(400);
		expect((await noId.json()).message).toContain('id');
		const badPage = await page.request.get(`${url}?limit=5000`);
		expect(badPage.status()).toBe(400);

		const ruth = await browser.newContext();
		const rp = await ruth.newPage();
		await signIn(rp, demo.ruth);
		const base = new URL(page.url()).origin;
		const forbidden = await rp.request.post(base + url, {
			data: { ...body, id: crypto.randomUUID() }
		});
		expect(forbidden.status()).toBe(403);
		await ruth.close();

		const other = await browser.newContext();
		const op = await other.newPage();
		await signIn(op, demo.otherTech);
		const hidden = await op.request.post(base + url, {
			data: { ...body, id: crypto.randomUUID() }
		});
		expect(hidden.status()).toBe(404);
		expect(await hidden.text()).not.toContain('1042');
		expect((await op.request.get(`${base}/api/jobs/${id1042}/steps`)).status()).toBe(404);
		await other.close();
	});
});
