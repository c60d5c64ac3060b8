// npm test: the same bootstrap as `npm start` against a separate test database, then
// svelte-check, lint, vitest (units and DB integration tests) and Playwright end-to-end tests
// in Debian's Chromium. Exits non-zero on any failure; ends with a one-line summary.
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { chromiumPath } from './lib/chromium.js';
import { config, root } from './lib/config.js';
import { startedHere, stopCluster } from './lib/pg.js';
import { ensurePackages, prepareDatabase } from './lib/prepare.js';
import { isRoot, must, run, step } from './lib/run.js';

const chromium = chromiumPath;
const reports = join(root, 'test-results', 'reports');
// `npm test -- e2e` runs one stage; any other word filters test files by name, as vitest and
// Playwright do (`npm test -- e2e voice-offline`).
const STAGES = ['check', 'lint', 'format', 'unit', 'db', 'e2e'];
const only = process.argv.slice(2).filter((a) => STAGES.includes(a));
const filters = process.argv.slice(2).filter((a) => !STAGES.includes(a));

await ensurePackages();
await ensureChromium();
const url = await prepareDatabase(config.testDbName, { fresh: true });
if (only.length === 0 || only.includes('e2e')) {
	const { ensureBuild } = await import('./lib/build.js');
	await ensureBuild();
}
rmSync(reports, { recursive: true, force: true });
mkdirSync(reports, { recursive: true });

const bin = (name) => join(root, 'node_modules', '.bin', name);
// Local mail sink and payment provider for the e2e stage (any free ports unless set).
const { startFakes } = await import('./lib/fakes.js');
const fakes = await startFakes({
	appOrigin: `http://127.0.0.1:${config.testPort}`,
	dataDir: join(config.dataDir, 'test'),
	smtpPort: config.testSmtpPort,
	paymentsPort: config.testPaymentsPort
});
const env = {
	...process.env,
	...fakes.env,
	DATABASE_URL: url,
	BENCHCALL_TEST_DATABASE_URL: url,
	BENCHCALL_CHROMIUM: chromium,
	BENCHCALL_UPLOADS_DIR: join(config.dataDir, 'test-uploads')
};

const stages = [
	{
		name: 'check',
		cmd: bin('svelte-check'),
		args: ['--tsconfig', './tsconfig.json', '--fail-on-warnings', '--output', 'machine']
	},
	{ name: 'lint', cmd: bin('eslint'), args: ['.'] },
	{ name: 'format', cmd: bin('prettier'), args: ['--check', '--log-level', 'warn', '.'] },
	{
		name: 'unit',
		cmd: bin('vitest'),
		args: [
			'run',
			'--project',
			'unit',
			'--reporter=default',
			'--reporter=json',
			`--outputFile.json=${join(reports, 'unit.json')}`
		],
		report: 'unit.json',
		kind: 'vitest'
	},
	{
		name: 'db',
		cmd: bin('vitest'),
		args: [
			'run',
			'--project',
			'db',
			'--reporter=default',
			'--reporter=json',
			`--outputFile.json=${join(reports, 'db.json')}`
		],
		report: 'db.json',
		kind: 'vitest'
	},
	{
		name: 'e2e',
		cmd: bin('playwright'),
		args: ['test', '--config', 'tests/playwright.config.ts'],
		report: 'e2e.json',
		kind: 'playwright',
		env: { PLAYWRIGHT_JSON_OUTPUT_NAME: join(reports, 'e2e.json') }
	}
];

const results = [];
for (const stage of stages) {
	if (only.length && !only.includes(stage.name)) continue;
	step(`${stage.name}`);
	const started = Date.now();
	const args = stage.report ? [...stage.args, ...filters] : stage.args;
	const code = await run(stage.cmd, args, { env: { ...env, ...stage.env } });
	results.push({ ...stage, code, seconds: (Date.now() - started) / 1000, counts: counts(stage) });
}

let passed = 0;
let failed = 0;
console.log('\nBenchcall test run');
for (const r of results) {
	const c = r.counts;
	if (c) {
		passed += c.passed;
		failed += c.failed;
	}
	// A stage that exits non-zero fails the run even when its report shows no failed test.
	if (r.code !== 0 && (!c || c.failed === 0)) failed += 1;
	const detail = c
		? `${c.passed} passed, ${c.failed} failed`
		: r.code === 0
			? 'clean'
			: 'problems found';
	console.log(
		`  ${r.code === 0 ? '✓' : '✗'} ${r.name.padEnd(7)} ${detail} (${r.seconds.toFixed(1)} s)`
	);
}
const stagesFailed = results.filter((r) => r.code !== 0).length;
fakes.close();
// On CI, leave nothing running: stop the cluster when this run started it.
if (process.env.CI && startedHere) await stopCluster();
console.log(`\nsummary: ${passed} passed, ${failed} failed`);
process.exit(stagesFailed > 0 ? 1 : 0);

function counts(stage) {
	if (!stage.report) return null;
	const file = join(reports, stage.report);
	if (!existsSync(file)) return null;
	try {
		const data = JSON.parse(readFileSync(file, 'utf8'));
		if (stage.kind === 'vitest')
			return { passed: data.numPassedTests, failed: data.numFailedTests };
		const s = data.stats;
		return { passed: s.expected + (s.flaky ?? 0), failed: s.unexpected };
	} catch {
		return null;
	}
}

async function ensureChromium() {
	if (existsSync(chromium)) return;
	if (!isRoot) {
		console.error(
			`\nChromium is missing. Install Debian's package once as root, then run again:\n\n    sudo apt-get update && sudo apt-get install -y chromium\n`
		);
		process.exit(1);
	}
	step("Installing Chromium from Debian's packages (once)");
	await must('apt-get', ['update', '-qq']);
	await must('apt-get', ['install', '-y', '-qq', 'chromium'], {
		env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
	});
}
