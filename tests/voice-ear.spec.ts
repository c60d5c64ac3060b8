/**
 * The Bench's ear through Chromium's fake microphone (one browser per recording: Chromium takes
 * the file at launch). A noisy phrase is logged right; a slow start loses no words, and a key
 * after loading readies the sound path; a phrase whose value cannot be right is refused with
 * "say it again" and nothing is logged; hands-free ignores shop talk and acts on the call-out
 * after it; silence, clipping and a 30 s recording each get a clear message and log nothing.
 * "Nothing logged" is checked through the job log's API, not only on the screen.
 * Recordings: tests/fixtures/voice/e2e (scripts/make-voice-e2e.sh); bad input is made from them.
 */
import { chromium, expect, test, type LaunchOptions, type Page } from '@playwright/test';
import { badWav, fakeMicrophoneArgs, paddedWav } from '../scripts/lib/voice-wav';
import { demo } from './helpers/auth';
import { openBench } from './helpers/bench';
import { entry, jobId } from './helpers/bench-db';

interface ApiEntry {
	id: string;
	seq: number;
}

/** Runs `fn` on a Bench page in a browser whose microphone plays `wavPath`. */
async function withMicrophone(
	info: { project: { use: { launchOptions?: LaunchOptions; baseURL?: string } } },
	wavPath: string,
	fn: (page: Page) => Promise<void>
) {
	const base = (info.project.use.launchOptions ?? {}) as LaunchOptions;
	const browser = await chromium.launch({
		...base,
		args: [...(base.args ?? []), ...fakeMicrophoneArgs(wavPath)]
	});
	try {
		const context = await browser.newContext({
			baseURL: info.project.use.baseURL,
			viewport: { width: 1280, height: 800 },
			permissions: ['microphone']
		});
		await fn(await context.newPage());
	} finally {
		await browser.close();
	}
}

/** Signs in, opens the job's Bench and loads offline voice with the given way of listening. */
async function openWithOfflineVoice(
	page: Page,
	who: string,
	job: number,
	mode: { handsFree?: boolean; pushToTalk?: boolean } = {}
) {
	await openBench(page, who, job);
	await page.getByTestId('voice-settings').locator('summary').click();
	await page.getByTestId('voice-choice').selectOption('offline');
	await expect(page.getByTestId('voice-ready')).toBeVisible({ timeout: 45_000 });
	await expect(page.getByTestId('voice-denoise')).toBeVisible();
	const ptt = page.getByRole('checkbox', { name: /Push-to-talk/ });
	if ((await ptt.isChecked()) !== (mode.pushToTalk ?? false)) await ptt.click();
	if (mode.handsFree) await page.getByTestId('hands-free').check();
}

/** The job log through its API: the newest seq now, and what came after a seq. */
async function logApi(page: Page, job: number) {
	const id = await jobId(job);
	const read = async (query: string) => {
		const res = await page.request.get(`/api/jobs/${id}/entries?${query}`);
		expect(res.status()).toBe(200);
		return ((await res.json()) as { entries: ApiEntry[] }).entries;
	};
	const latest = (await read('limit=1'))[0]?.seq ?? 0;
	return { latest, since: () => read(`after=${latest}&limit=200`) };
}

/** Counts the capture worklet's loads on the page: each is a sound path built. */
async function countSoundPaths(page: Page, delayMs = 0) {
	await page.addInitScript((delay) => {
		const w = window as unknown as { soundPaths: number };
		w.soundPaths = 0;
		const add = AudioWorklet.prototype.addModule;
		AudioWorklet.prototype.addModule = async function (...args) {
			w.soundPaths++;
			if (delay) await new Promise((r) => setTimeout(r, delay));
			return add.apply(this, args);
		};
	}, delayMs);
	return () => page.evaluate(() => (window as unknown as { soundPaths: number }).soundPaths);
}

/**
 * The job log gained an entry, and the Bench shows it at the top. (Its first entry alone can
 * be one an earlier test logged for the same step.)
 */
async function expectLogged(page: Page, log: { since: () => Promise<ApiEntry[]> }) {
	await expect
		.poll(async () => (await log.since()).length, { timeout: 45_000, intervals: [500] })
		.toBeGreaterThan(0);
	const [first] = await log.since();
	await expect(page.getByTestId('log-entry').first()).toHaveAttribute('data-entry-id', first.id);
}

/**
 * Once the microphone has stopped (stop() decodes what was left and then ends: no phrase comes
 * after it), no confirm window is open and the outbox is empty, the job log gained nothing.
 */
async function expectNothingLogged(page: Page, log: { since: () => Promise<ApiEntry[]> }) {
	await expect(page.getByRole('button', { name: /Start listening/ })).toBeVisible();
	await expect(page.getByTestId('countdown')).toHaveCount(0);
	await expect(page.getByTestId('waiting')).toHaveCount(0);
	expect(await log.since()).toEqual([]);
}

test.describe('the Bench’s ear', () => {
	// a browser, the model and a phrase per test; a busy 2-core machine needs the room
	test.describe.configure({ timeout: 120_000 });

	// eslint-disable-next-line no-empty-pattern -- Playwright wants the fixtures argument first
	test('a phrase under pink noise at 10 dB SNR is logged right', async ({}, info) => {
		const wav = paddedWav('e2e/noisy-pink-10db-rear-axle-90-nm.wav', 8);
		await withMicrophone(info, wav, async (page) => {
			await openWithOfflineVoice(page, demo.ruth, 1043);
			const log = await logApi(page, 1043);
			await page.getByRole('button', { name: /Start listening/ }).click();
			// the phrase, the confirm window (3 s) and the outbox; slow when the machine is busy
			await expectLogged(page, log);
			await page.getByRole('button', { name: 'Stop listening' }).click();
			// the noise was suppressed on the audio thread, in the capture worklet
			await expect(page.getByTestId('voice-denoise')).toHaveAttribute('data-running', 'true');
			const added = await log.since();
			expect(added).toHaveLength(1);
			// demo spec of the rear axle nut: 80–96 N·m (invented values)
			expect(await entry(added[0].id)).toMatchObject({
				source: 'voice',
				value: 90,
				unit: 'N.m',
				verdict: 'in'
			});
		});
	});

	// eslint-disable-next-line no-empty-pattern
	test('a slow start loses no words: the Bench says it is starting until the microphone is heard, and the next call starts at once', async ({}, info) => {
		await withMicrophone(info, paddedWav('rear-axle-88-nm.wav', 8), async (page) => {
			// a slow device or connection: the capture worklet takes 2 s to load. The fake
			// microphone starts its file when it is opened; opened before the worklet was ready,
			// it lost the call's first words (heard "…": say it again)
			const soundPaths = await countSoundPaths(page, 2000);
			// every refusal or unread notice shown, however briefly
			await page.addInitScript(() => {
				const seen: string[] = [];
				(window as unknown as { noticesSeen: string[] }).noticesSeen = seen;
				new MutationObserver(() => {
					for (const id of ['say-again', 'voice-unread', 'voice-ignored']) {
						const text = document.querySelector(`[data-testid="${id}"]`)?.textContent;
						if (text && !seen.includes(text)) seen.push(text);
					}
				}).observe(document, { childList: true, subtree: true });
			});
			await openWithOfflineVoice(page, demo.ruth, 1043);
			const log = await logApi(page, 1043);
			await page.getByRole('button', { name: /Start listening/ }).click();
			const bar = page.getByRole('combobox', { name: 'Call bar' });
			await expect(bar).toHaveAttribute('placeholder', 'Starting the microphone…');
			await expect(bar).toHaveAttribute('placeholder', /^Listening/, { timeout: 30_000 });
			await expectLogged(page, log);
			await page.getByRole('button', { name: 'Stop listening' }).click();
			// the next call on this page reuses the sound path: only the microphone opens again,
			// and nothing of the last call's sound leaks into it
			const before = await logApi(page, 1043);
			await page.getByRole('button', { name: /Start listening/ }).click();
			await expect(bar).toHaveAttribute('placeholder', /^Listening/, { timeout: 30_000 });
			await expectLogged(page, before);
			await page.getByRole('button', { name: 'Stop listening' }).click();
			expect(
				await page.evaluate(() => (window as unknown as { noticesSeen: string[] }).noticesSeen)
			).toEqual([]);
			expect(await soundPaths()).toBe(1);
			const added = await log.since();
			expect(added).toHaveLength(2);
			for (const e of added)
				// demo spec of the rear axle nut: 80–96 N·m (invented values)
				expect(await entry(e.id)).toMatchObject({
					source: 'voice',
					value: 88,
					unit: 'N.m',
					verdict: 'in'
				});
		});
	});

	// eslint-disable-next-line no-empty-pattern
	test('a value ten times the spec is refused: say it again, nothing logged', async ({}, info) => {
		await withMicrophone(info, paddedWav('e2e/rear-axle-800-nm.wav', 8), async (page) => {
			const soundPaths = await countSoundPaths(page);
			await openWithOfflineVoice(page, demo.ruth, 1043);
			const log = await logApi(page, 1043);
			// the first key after loading builds the sound path, so the press waits for less
			expect(await soundPaths()).toBe(0);
			await page.keyboard.press('Shift');
			await expect.poll(soundPaths).toBe(1);
			await page.getByRole('button', { name: /Start listening/ }).click();
			const notice = page.getByTestId('say-again');
			await expect(notice).toBeVisible({ timeout: 45_000 });
			await expect(notice).toContainText('Say it again');
			await expect(page.getByTestId('say-again-heard')).toContainText(/rear axle/i);
			await expect(notice).toContainText('Nothing was logged');
			await page.getByRole('button', { name: 'Stop listening' }).click();
			await expectNothingLogged(page, log);
			expect(await soundPaths()).toBe(1);
		});
	});

	// eslint-disable-next-line no-empty-pattern
	test('hands-free ignores shop talk and logs the call-out after it', async ({}, info) => {
		const wav = paddedWav('e2e/shop-talk-then-chain-slack-25-mm.wav', 14);
		await withMicrophone(info, wav, async (page) => {
			await openWithOfflineVoice(page, demo.ruth, 1043, { handsFree: true });
			const log = await logApi(page, 1043);
			// no key, no button: hands-free starts listening by itself
			// once the microphone's sound arrives (before that: "starting the microphone")
			await expect(page.getByTestId('hands-free-status')).toContainText('listening', {
				timeout: 30_000
			});
			await expect(page.getByRole('button', { name: 'Stop listening' })).toBeVisible();
			await expect(page.getByTestId('voice-ignored').first()).toBeVisible({ timeout: 45_000 });
			await expect(page.getByTestId('log-entry').first()).toContainText('Drive chain slack', {
				timeout: 30_000
			});
			const added = await log.since();
			expect(added).toHaveLength(1);
			expect(await entry(added[0].id)).toMatchObject({
				source: 'voice',
				value: 25,
				unit: 'mm',
				verdict: 'in' // demo spec 20–30 mm
			});
			await page.getByTestId('hands-free').uncheck();
		});
	});

	const bad = [
		{
			name: 'a silent microphone',
			wav: () => badWav.silence(),
			says: /no sound at all/
		},
		{
			name: 'a clipped phrase',
			wav: () => badWav.clipped('e2e/rear-axle-800-nm.wav'),
			says: /the sound is clipped/
		},
		{
			name: 'a 30 s recording',
			wav: () => badWav.long('e2e/rear-axle-800-nm.wav', 30),
			says: /say one call at a time/
		}
	];
	for (const b of bad) {
		// eslint-disable-next-line no-empty-pattern
		test(`${b.name}: a clear message, nothing logged`, async ({}, info) => {
			await withMicrophone(info, b.wav(), async (page) => {
				const errors: string[] = [];
				page.on('pageerror', (e) => errors.push(e.message));
				await openWithOfflineVoice(page, demo.ruth, 1043);
				const log = await logApi(page, 1043);
				await page.getByRole('button', { name: /Start listening/ }).click();
				const unread = page.getByTestId('voice-unread');
				await expect(unread).toContainText(b.says, { timeout: 40_000 });
				await expect(unread).toContainText('Nothing was logged');
				await page.getByRole('button', { name: 'Stop listening' }).click();
				await expectNothingLogged(page, log);
				expect(errors).toEqual([]);
			});
		});
	}
});
