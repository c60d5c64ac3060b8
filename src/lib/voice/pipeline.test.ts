/**
 * The committed part of the voice corpus (tests/fixtures/voice/corpus, several voices, clean
 * and noisy, shop talk and bad input) through the whole offline path: RNNoise, the decoder,
 * the phrase engine and the gate. What matters is that nothing wrong reaches the job log:
 * every call the gate lets through must be what was said; shop talk and bad input are refused
 * with a clear message.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import createModule from 'soundswallower';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { StepSpec } from '../phrase/index';
import { readWav, readWavForModel, SAMPLE_RATE } from './audio';
import { createDecoder, useGrammar, type Decoder } from './decoder';
import { loadRnnoise, type RnnoiseModule } from './denoise';
import { hearCall, LOGGING_INTENTS, sameCall } from './pipeline';

const root = new URL('../../../', import.meta.url);
const dir = fileURLToPath(new URL('tests/fixtures/voice/corpus/', root));
interface Entry {
	file: string;
	id: string;
	voice?: string;
	level?: string;
}
const set = JSON.parse(readFileSync(dir + 'set.json', 'utf8')) as {
	calls: Entry[];
	shopTalk: Entry[];
	bad: string[];
	resampled: Entry[];
};
const list = JSON.parse(
	readFileSync(fileURLToPath(new URL('scripts/voice-corpus/phrases.json', root)), 'utf8')
) as { phrases: { id: string; job: number; text: string }[] };
const jobs = JSON.parse(
	readFileSync(fileURLToPath(new URL('tests/fixtures/voice/manifest.json', root)), 'utf8')
).jobs as Record<string, Omit<StepSpec, 'id'>[]>;
const stepsOf = (job: number): StepSpec[] => jobs[String(job)].map((s) => ({ ...s, id: s.label }));
const phrase = (id: string) => {
	const p = list.phrases.find((x) => x.id === id);
	if (!p) throw new Error(`no phrase ${id}`);
	return p;
};

let decoder: Decoder;
let rnnoise: RnnoiseModule;
let job = -1;
beforeAll(async () => {
	const modelBase = fileURLToPath(new URL('node_modules/soundswallower/model/', root));
	const ss = await createModule({ modelBase } as never);
	decoder = await createDecoder(ss);
	rnnoise = await loadRnnoise();
}, 60_000);
afterAll(() => decoder?.delete());

function hear(file: string, jobNo: number) {
	const steps = stepsOf(jobNo);
	if (job !== jobNo) {
		useGrammar(decoder, { steps });
		job = jobNo;
	}
	return {
		steps,
		h: hearCall(decoder, readWavForModel(readFileSync(dir + file)), steps, { rnnoise })
	};
}

describe('calls from the corpus (clean and noisy, several voices)', () => {
	const accepted: string[] = [];
	for (const e of set.calls) {
		it(`${e.voice} ${e.level}: nothing wrong is logged for "${phrase(e.id).text}"`, () => {
			const p = phrase(e.id);
			const { steps, h } = hear(e.file, p.job);
			if (h.gate.ok) {
				accepted.push(e.file);
				expect(sameCall(h.text, p.text, steps), `heard "${h.text}"`).toBe(true);
			} else {
				expect(h.gate.message).toMatch(/^Say it again — heard /);
				expect(h.gate.heard).toBe(h.text);
			}
		}, 30_000);
	}
	it('hears at least half the clean ones right (the gate is not simply refusing everything)', () => {
		// measured on 2026-12-04: 2 of 4 (flite kal16's "ninety" is heard as "nineteen" and refused
		// as implausible for an 80–96 N·m step; espeak's "next step" falls into the out-of-grammar path)
		const clean = set.calls.filter((e) => e.level === 'clean').map((e) => e.file);
		expect(accepted.filter((f) => clean.includes(f)).length).toBeGreaterThanOrEqual(
			Math.ceil(clean.length / 2)
		);
	});
});

describe('shop talk in hands-free mode', () => {
	for (const e of set.shopTalk) {
		it(`${e.voice} ${e.level} ${e.id}: not acted on`, () => {
			const { h } = hear(e.file, 1041);
			expect(h.gate.ok, `heard "${h.text}"`).toBe(false);
		}, 30_000);
	}
});

describe('bad input: a clear message, nothing logged', () => {
	const messages: Record<string, RegExp> = {
		'bad-silence.wav': /Nothing heard/,
		'bad-clipped.wav': /Too loud/,
		'bad-30s.wav': /say one call at a time/
	};
	for (const file of set.bad) {
		it(
			file,
			() => {
				const { h } = hear(file, 1041);
				expect(h.gate).toMatchObject({ ok: false, message: messages[file] });
				expect(h.parsed).toBeNull();
			},
			30_000
		);
	}
	for (const e of set.resampled) {
		it(`${e.file}: read at any rate and width, and nothing wrong logged`, () => {
			const { sampleRate } = readWav(readFileSync(dir + e.file));
			expect([8000, 16000, 44100]).toContain(sampleRate);
			const p = phrase(e.id);
			const { steps, h } = hear(e.file, p.job);
			if (h.gate.ok && h.parsed && LOGGING_INTENTS.has(h.parsed.intent))
				expect(sameCall(h.text, p.text, steps), `heard "${h.text}"`).toBe(true);
		}, 30_000);
	}
	it('names what is wrong with a file that is not audio', () => {
		expect(() => readWav(new TextEncoder().encode('hello'))).toThrow('Not a WAV file.');
		expect(readWavForModel(readFileSync(dir + 'rate-44k-stereo-p19.wav')).length).toBeGreaterThan(
			SAMPLE_RATE
		);
	});
});
