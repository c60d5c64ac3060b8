import { defineConfig } from '@playwright/test';
import { fileURLToPath } from 'node:url';
import { chromiumArgs, chromiumPath } from '../scripts/lib/chromium.js';

// Lives in tests/ to keep the top level to what the project conventions list.
const root = fileURLToPath(new URL('..', import.meta.url));

const port = Number(process.env.BENCHCALL_TEST_PORT ?? 4173);
const origin = `http://127.0.0.1:${port}`;

export default defineConfig({
	testDir: '.',
	testMatch: '**/*.spec.ts',
	// Two workers, the app, PostgreSQL and Chromium share 2 cores: a whole flow can take 30 s.
	timeout: 60_000,
	expect: { timeout: 5_000 },
	fullyParallel: false,
	workers: 2,
	retries: 0,
	forbidOnly: true,
	reporter: [['list'], ['json']],
	outputDir: `${root}/test-results/e2e`,
	use: {
		baseURL: origin,
		trace: 'retain-on-failure',
		screenshot: 'only-on-failure',
		video: 'off',
		viewport: { width: 1280, height: 800 },
		launchOptions: {
			executablePath: chromiumPath,
			args: chromiumArgs
		}
	},
	webServer: {
		command: 'node build',
		cwd: root,
		url: `${origin}/sign-in`,
		reuseExistingServer: false,
		timeout: 60_000,
		stdout: 'ignore',
		stderr: 'pipe',
		env: {
			HOST: '127.0.0.1',
			PORT: String(port),
			ORIGIN: origin,
			DATABASE_URL: process.env.BENCHCALL_TEST_DATABASE_URL ?? '',
			BENCHCALL_UPLOADS_DIR: process.env.BENCHCALL_UPLOADS_DIR ?? '.data/test-uploads',
			BODY_SIZE_LIMIT: '12M',
			// The local mail sink and payment provider that scripts/test.js started.
			...Object.fromEntries(
				[
					'SMTP_URL',
					'STRIPE_SECRET_KEY',
					'STRIPE_WEBHOOK_SECRET',
					'STRIPE_API_HOST',
					'STRIPE_API_PORT',
					'STRIPE_API_PROTOCOL'
				].map((k) => [k, process.env[k] ?? ''])
			)
		}
	}
});
