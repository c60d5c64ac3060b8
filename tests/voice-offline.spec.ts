/**
 * Offline voice end to end: Chromium's fake microphone plays a committed spoken test phrase
 * (tests/fixtures/voice, made with flite), the Bench listens with the offline recogniser and the
 * phrase is logged through the same confirm window as any voice entry. One browser per WAV:
 * Chromium takes the fake microphone's file at launch.
 */
import { chromium, expect, test, type LaunchOptions } from '@playwright/test';
import { fakeMicrophoneArgs, paddedWav } from '../scripts/lib/voice-wav';
import { demo, signIn } from './helpers/auth';
import { entry } from './helpers/bench-db';

const cases = [
	{
		file: 'rear-axle-88-nm.wav',
		job: 1041,
		step: 'Rear axle nut',
		value: 88,
		unit: 'N.m',
		verdict: 'in'
	},
	{
		file: 'header-nuts-25-nm.wav',
		job: 1042,
		step: 'Exhaust header nuts',
		value: 25,
		unit: 'N.m',
		verdict: 'high'
	},
	{
		file: 'noisy-clutch-lever-15-mm.wav',
		job: 1041,
		step: 'Clutch lever free play',
		value: 15,
		unit: 'mm',
		verdict: 'in'
	}
];

test.describe('offline voice on the Bench', () => {
	for (const c of cases) {
		test(
			`${c.file} is logged as ${c.step} ${c.value} ${c.unit}, ${c.verdict}`, // eslint-disable-next-line no-empty-pattern -- Playwright wants the fixtures argument first
			async ({}, info) => {
				test.setTimeout(60_000);
				const base = (info.project.use.launchOptions ?? {}) as LaunchOptions;
				const browser = await chromium.launch({
					...base,
					args: [...(base.args ?? []), ...fakeMicrophoneArgs(paddedWav(c.file))]
				});
				try {
					const context = await browser.newContext({
						baseURL: info.project.use.baseURL,
						viewport: { width: 1280, height: 800 },
						permissions: ['microphone']
					});
					const page = await context.newPage();
					await signIn(page, demo.tomasz);
					await page.goto(`/bench?job=${c.job}`);
					await expect(
						page.getByRole('heading', { name: new RegExp(`Job ${c.job}`) })
					).toBeVisible();

					// switch to offline voice and wait for the model
					await page.getByTestId('voice-settings').locator('summary').click();
					await page.getByTestId('voice-choice').selectOption('offline');
					await expect(page.getByTestId('voice-ready')).toBeVisible({ timeout: 20_000 });
					await expect(page.getByTestId('voice-missing')).toHaveCount(0);

					const rows = page.getByTestId('log-entry');
					const before = await rows.count();
					await page.getByRole('button', { name: /Start listening/ }).click();
					await expect(page.getByTestId('voice-level')).not.toHaveAttribute('aria-valuenow', '0', {
						timeout: 10_000
					});
					// logged after the confirm window, like any voice entry; a value out of spec heard
					// without the surer confidence it needs waits in the call bar for Enter (gate.ts)
					const unsure = page.getByText(/Heard a value out of spec, not for sure/);
					await expect
						.poll(async () => (await rows.count()) > before || (await unsure.isVisible()), {
							timeout: 25_000
						})
						.toBe(true);
					if (await unsure.isVisible()) {
						expect(c.verdict).not.toBe('in');
						await page.keyboard.press('Enter');
					}
					await expect(rows).toHaveCount(before + 1, { timeout: 25_000 });
					// the settings panel says how long the phrase took to read
					await expect(page.getByTestId('voice-decode-ms')).toContainText(
						/Last phrase read in \d+ ms/
					);
					const first = rows.first();
					await expect(first).toContainText(c.step);
					await expect(first).toHaveAttribute('data-verdict', c.verdict);
					const stored = await entry((await first.getAttribute('data-entry-id'))!);
					expect(stored).toMatchObject({
						kind: 'measure',
						source: 'voice',
						value: c.value,
						unit: c.unit,
						verdict: c.verdict
					});
					await page.getByRole('button', { name: 'Stop listening' }).click();
				} finally {
					await browser.close();
				}
			}
		);
	}
});
