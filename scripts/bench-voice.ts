/**
 * Offline voice benchmark. By default: the voice corpus (.data/voice-corpus, made by
 * `npm run voice:corpus`) through noise suppression, decoder, phrase engine and gate, as a table
 * per voice × noise level for the tuning and held-out splits (scripts/lib/voice-corpus-bench.ts).
 * With --fixtures: model load, grammar build and p50 / p95 decode time per committed test
 * phrase (tests/fixtures/voice). It prints figures only; nothing here is asserted. Goals:
 * decode ≤ 300 ms per phrase including noise suppression, model load ≤ 2 s.
 *
 *   npm run bench:voice                         (the corpus; --quick corpus if that is what was made)
 *   npm run bench:voice -- --split=tune         (tuning split only; --split=held for the other)
 *   npm run bench:voice -- --only=flite-slt     (voices whose name holds this)
 *   npm run bench:voice -- --no-denoise --set=lw:8,beam:1e-60 --min-confidence=0.7 --every=3
 *   npm run bench:voice -- --verbose            (list every wrong value logged)
 *   npm run bench:voice -- --dump=rows.json     (every phrase: what was heard, its confidence)
 *   npm run bench:voice -- --fixtures [20]      (the committed fixtures, 5 or 20 rounds)
 *   npm run bench:voice -- --browser (then the same in Debian's Chromium, on the built app: one
 *                                     browser per phrase with the WAV as its microphone; model
 *                                     load first from the network, then from the browser's cache,
 *                                     and the decode time the Bench reports)
 */
import { readFileSync } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import createModule from 'soundswallower';
import { parsePhrase, isCancel, type StepSpec } from '../src/lib/phrase/index';
import { createDecoder, decodePhrase, readWav, useGrammar } from '../src/lib/voice/decoder';

import { corpusBench, corpusOptions } from './lib/voice-corpus-bench';

const browserToo = process.argv.includes('--browser');
const fixtures = browserToo || process.argv.includes('--fixtures');
const rounds = Math.max(1, Number(process.argv.find((a) => /^\d+$/.test(a))) || 5);
const dir = fileURLToPath(new URL('../tests/fixtures/voice/', import.meta.url));
const manifest = JSON.parse(readFileSync(dir + 'manifest.json', 'utf8')) as {
	jobs: Record<string, Omit<StepSpec, 'id'>[]>;
	phrases: {
		file: string;
		job: number;
		text: string;
		intent: string;
		step: string | null;
		value: number | null;
		unit: string | null;
	}[];
};

function pct(sorted: number[], p: number): number {
	return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
}
const ms = (n: number) => `${n.toFixed(0).padStart(5)} ms`;

const t0 = performance.now();
const modelBase = fileURLToPath(new URL('../node_modules/soundswallower/model/', import.meta.url));
const ss = await createModule({ modelBase } as never);
const decoder = await createDecoder(ss);
const loadMs = performance.now() - t0;
console.log(`model load (WASM + acoustic model + dictionary): ${ms(loadMs)}`);
if (!fixtures) {
	decoder.delete();
	await corpusBench(ss, corpusOptions(process.argv));
	process.exit(0);
}

const all: number[] = [];
let right = 0;
let currentJob = -1;
for (const p of manifest.phrases) {
	const steps = manifest.jobs[String(p.job)].map((s) => ({ ...s, id: s.label }));
	if (p.job !== currentJob) {
		const g0 = performance.now();
		const g = useGrammar(decoder, { steps });
		console.log(
			`job ${p.job}: grammar of ${g.words.length} words built in ${ms(performance.now() - g0)}` +
				(g.missing.length ? `; left out: ${g.missing.join(', ')}` : '')
		);
		currentJob = p.job;
	}
	const { samples } = readWav(readFileSync(dir + p.file));
	const times: number[] = [];
	let heard = '';
	for (let i = 0; i < rounds; i++) {
		const s = performance.now();
		heard = decodePhrase(decoder, samples).text;
		times.push(performance.now() - s);
	}
	times.sort((a, b) => a - b);
	all.push(...times);
	const r = parsePhrase(heard, { steps });
	const ok =
		p.intent === 'cancel'
			? isCancel(heard)
			: r.intent === p.intent &&
				r.stepId === p.step &&
				(r.quantity?.value ?? null) === p.value &&
				(r.quantity?.unit ?? null) === p.unit;
	if (ok) right++;
	const secs = (samples.length / 16000).toFixed(1);
	console.log(
		`${ok ? 'ok  ' : 'MISS'} p50 ${ms(pct(times, 50))}  p95 ${ms(pct(times, 95))}  ${secs} s  ${p.file}: "${heard}"`
	);
}
all.sort((a, b) => a - b);
console.log(
	`all phrases (${rounds} rounds): p50 ${ms(pct(all, 50))}, p95 ${ms(pct(all, 95))}; ` +
		`${right}/${manifest.phrases.length} right`
);
decoder.delete();

if (browserToo) await inChromium();

/** The same phrases through the Bench in Chromium: what a technician's browser does. */
async function inChromium() {
	const { chromium } = await import('@playwright/test');
	const { ensureBuild } = await import('./lib/build.js');
	const { chromiumArgs, chromiumPath } = await import('./lib/chromium.js');
	const { demoPassword } = await import('./lib/demo.js');
	const { prepareDatabase } = await import('./lib/prepare.js');
	const { startApp } = await import('./lib/harness');
	const { fakeMicrophoneArgs, paddedWav } = await import('./lib/voice-wav');
	const { tmpdir } = await import('node:os');
	const { join } = await import('node:path');

	const url = await prepareDatabase('benchcall_bench_voice', { fresh: true });
	await ensureBuild();
	const app = await startApp({
		port: Number(process.env.BENCH_PORT ?? 4197),
		databaseUrl: url,
		logFile: join(tmpdir(), 'benchcall-bench-voice-app.log')
	});
	const cold: number[] = [];
	const cached: number[] = [];
	const decode: number[] = [];
	const untouched: number[] = [];
	const touched: number[] = [];
	const again: number[] = [];
	const denoised: boolean[] = [];
	console.log('\nin Chromium (the built app, one browser per phrase):');
	try {
		for (const p of manifest.phrases) {
			const browser = await chromium.launch({
				executablePath: chromiumPath,
				args: [...chromiumArgs, ...fakeMicrophoneArgs(paddedWav(p.file, 4))]
			});
			try {
				const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
				await page.goto(`${app.base}/sign-in`);
				await page.getByLabel('E-mail').fill('tomasz@kettlestreet.test');
				await page.getByLabel('Password').fill(demoPassword);
				await page.getByRole('button', { name: 'Sign in' }).click();
				await page.waitForURL(/\/bench/);
				const loadOffline = async () => {
					await page.goto(`${app.base}/bench?job=${p.job}`);
					await page.getByTestId('voice-settings').locator('summary').click();
					await page.getByTestId('voice-choice').selectOption('offline');
					const ready = page.getByTestId('voice-ready');
					await ready.waitFor({ timeout: 30_000 });
					return Number((await ready.textContent())?.match(/loaded in ([\d.]+) s/)?.[1]) * 1000;
				};
				// from the press until the microphone's sound reaches the recogniser: the call bar
				// then says listening
				const bar = page.getByRole('combobox', { name: 'Call bar' });
				const pressToListening = async () => {
					const pressed = Date.now();
					await page.getByRole('button', { name: /Start listening/ }).click();
					await page.waitForFunction(
						(el) => (el as HTMLInputElement).placeholder.startsWith('Listening'),
						await bar.elementHandle(),
						{ polling: 10, timeout: 20_000 }
					);
					return Date.now() - pressed;
				};
				cold.push(await loadOffline());
				// the press is the page's first touch: the worklet loads and RNNoise starts now
				untouched.push(await pressToListening());
				await page.getByRole('button', { name: 'Stop listening' }).click();
				cached.push(await loadOffline());
				// a key or touch after loading makes the sound path; the press then opens the microphone
				await page.keyboard.press('Shift');
				await page.waitForTimeout(1500);
				touched.push(await pressToListening());
				// the time the Bench reports is decoding after the phrase ends; suppression ran in
				// the capture worklet while it was spoken (checked running here)
				const denoise = page.getByTestId('voice-denoise');
				const took = page.getByTestId('voice-decode-ms');
				await took.waitFor({ timeout: 20_000 });
				denoised.push((await denoise.getAttribute('data-running')) === 'true');
				const ms = Number(await took.getAttribute('data-ms'));
				decode.push(ms);
				console.log(`${String(ms).padStart(5)} ms  ${p.file}`);
				// a second press on the same page: the sound path is kept, only the microphone opens
				await page.getByRole('button', { name: 'Stop listening' }).click();
				again.push(await pressToListening());
			} finally {
				await browser.close();
			}
		}
	} finally {
		app.proc.kill('SIGTERM');
	}
	for (const list of [cold, cached, decode, untouched, touched, again]) list.sort((a, b) => a - b);
	console.log(
		`Chromium: model load p50 ${ms(pct(cold, 50))} first, ${ms(pct(cached, 50))} from cache ` +
			`(p95 ${ms(pct(cached, 95))}); decode p50 ${ms(pct(decode, 50))}, p95 ${ms(pct(decode, 95))}` +
			` after the phrase (suppression in the worklet for ${denoised.filter(Boolean).length}/${denoised.length}); ` +
			`press to listening p50 / p95: ${ms(pct(untouched, 50))} / ${ms(pct(untouched, 95))} as ` +
			`the page's first touch, ${ms(pct(touched, 50))} / ${ms(pct(touched, 95))} after one, ` +
			`${ms(pct(again, 50))} / ${ms(pct(again, 95))} for the next call`
	);
	process.exit(0);
}
