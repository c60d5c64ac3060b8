/**
 * Offline voice benchmark: loads the soundswallower model, builds each demo job's grammar and
 * decodes every committed test phrase (tests/fixtures/voice) several times. Prints model load
 * time, grammar build time and p50 / p95 decode time per phrase, with what was heard; then the
 * same phrases streamed in 100 ms blocks as the Bench listens, with the wait after the last
 * block (what the technician waits for) and the decoder's share of the speaking time. It prints
 * figures only; nothing here is asserted. Goal (issue 5): decode ≤ 300 ms per phrase and model
 * load ≤ 2 s on a 2-core machine.
 *
 *   npm run bench:voice            (5 rounds)
 *   npm run bench:voice -- 20      (20 rounds)
 */
import { readFileSync } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import createModule from 'soundswallower';
import { parsePhrase, isCancel, type StepSpec } from '../src/lib/phrase/index';
import {
	createDecoder,
	decodePhrase,
	feedPhrase,
	finishPhrase,
	partialPhrase,
	readWav,
	startPhrase,
	useGrammar
} from '../src/lib/voice/decoder';

const rounds = Math.max(1, Number(process.argv[2]) || 5);
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

const all: number[] = [];
const BLOCK = 1600; // 100 ms at 16 kHz, the capture worklet's block
const waits: number[] = [];
const cpu: number[] = [];
const streamDiffers: string[] = [];
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
		heard = decodePhrase(decoder, samples);
		times.push(performance.now() - s);
	}
	times.sort((a, b) => a - b);
	all.push(...times);
	// As the Bench listens: 100 ms blocks fed as they arrive (with the interim words read after
	// each), then the wait from the last block to the final words.
	for (let i = 0; i < rounds; i++) {
		let spent = 0;
		let last = 0;
		startPhrase(decoder);
		for (let at = 0; at < samples.length; at += BLOCK) {
			const s = performance.now();
			feedPhrase(decoder, samples.subarray(at, at + BLOCK));
			partialPhrase(decoder);
			last = performance.now() - s;
			spent += last;
		}
		const s = performance.now();
		const streamed = finishPhrase(decoder);
		const fin = performance.now() - s;
		waits.push(last + fin);
		cpu.push((spent + fin) / ((samples.length / 16000) * 1000));
		if (streamed !== heard) streamDiffers.push(`${p.file}: "${streamed}"`);
	}
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
waits.sort((a, b) => a - b);
cpu.sort((a, b) => a - b);
console.log(
	`whole-phrase decode, all phrases (${rounds} rounds): p50 ${ms(pct(all, 50))}, p95 ${ms(pct(all, 95))}; ` +
		`${right}/${manifest.phrases.length} right`
);
console.log(
	`streamed in 100 ms blocks (as the Bench listens): wait after the last block p50 ${ms(pct(waits, 50))}, ` +
		`p95 ${ms(pct(waits, 95))}; decoder busy ${(pct(cpu, 50) * 100).toFixed(0)} % of the speaking time (p50)` +
		(streamDiffers.length
			? `; heard differently: ${streamDiffers.join('; ')}`
			: '; same words as whole-phrase')
);
decoder.delete();
