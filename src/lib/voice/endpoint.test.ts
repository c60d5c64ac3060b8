/**
 * Cutting the microphone's stream into calls: two phrases with quiet between them come out as
 * two calls that hold their speech; a phrase still going at the longest call is cut there; a
 * held key keeps everything until release; and soundswallower's detector finds the same phrase
 * in low noise. The raw and the cleaned samples of a call stay aligned.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import createModule, { type SoundSwallowerModule } from 'soundswallower';
import { beforeAll, describe, expect, it } from 'vitest';
import { readWavForModel, SAMPLE_RATE } from './audio';
import {
	HeldEndpoint,
	LevelEndpoint,
	joined,
	MAX_UTTERANCE_MS,
	VadEndpoint,
	type Endpoint,
	type Utterance
} from './endpoint';

const dir = fileURLToPath(new URL('../../../tests/fixtures/voice/', import.meta.url));
const phrase = readWavForModel(readFileSync(dir + 'rear-axle-88-nm.wav'));
let ss: SoundSwallowerModule;
beforeAll(async () => {
	const modelBase = fileURLToPath(
		new URL('../../../node_modules/soundswallower/model/', import.meta.url)
	);
	ss = await createModule({ modelBase } as never);
}, 30_000);

/** Repeatable low noise (Park–Miller), so quiet is not digital silence. */
function hiss(n: number, level = 0.002, seed = 7): Float32Array {
	const out = new Float32Array(n);
	let s = seed;
	for (let i = 0; i < n; i++) {
		s = (s * 16807) % 2147483647;
		out[i] = (s / 2147483647 - 0.5) * 2 * level;
	}
	return out;
}

/** Feeds 100 ms blocks (the same samples as raw and clean, so alignment can be checked). */
function cut(ep: Endpoint, samples: Float32Array): Utterance[] {
	const out: Utterance[] = [];
	for (let at = 0; at < samples.length; at += 1600) {
		const b = samples.slice(at, at + 1600);
		const u = ep.push(b, b);
		if (u) out.push(u);
	}
	const last = ep.flush();
	if (last) out.push(last);
	return out;
}

const rms = (x: Float32Array) =>
	Math.sqrt(x.reduce((s, v) => s + v * v, 0) / Math.max(1, x.length));
const speechRms = rms(phrase);

describe.each([
	['level', () => new LevelEndpoint()],
	['vad', () => new VadEndpoint(ss)]
])('%s endpoint', (_name, make) => {
	it('cuts two phrases with a pause between them into two calls', () => {
		const second = 1 * SAMPLE_RATE;
		const stream = joined([
			hiss(second),
			phrase,
			hiss(2 * second, 0.002, 9),
			phrase,
			hiss(second, 0.002, 11)
		]);
		const calls = cut(make(), stream);
		expect(calls).toHaveLength(2);
		for (const c of calls) {
			expect(c.raw).toEqual(c.clean);
			// each call holds most of a phrase (its speech, not only its edges) and not two
			expect(c.raw.length).toBeGreaterThan(phrase.length * 0.6);
			expect(c.raw.length).toBeLessThan(phrase.length * 1.8);
			expect(rms(c.raw)).toBeGreaterThan(speechRms * 0.7);
		}
	});

	it('hears nothing in quiet', () => {
		expect(cut(make(), hiss(3 * SAMPLE_RATE))).toEqual([]);
	});
});

describe('longest call', () => {
	it('level: a call still going at the longest one is cut there', () => {
		// speech-loud noise that never pauses
		const calls = cut(new LevelEndpoint(), hiss(15 * SAMPLE_RATE, 0.2));
		expect(calls.length).toBeGreaterThanOrEqual(1);
		expect((calls[0].raw.length / SAMPLE_RATE) * 1000).toBeGreaterThanOrEqual(MAX_UTTERANCE_MS);
		expect((calls[0].raw.length / SAMPLE_RATE) * 1000).toBeLessThan(MAX_UTTERANCE_MS + 400);
	});

	it('held key: everything until release is one call, quiet included', () => {
		const stream = joined([hiss(8000), phrase, hiss(16000), phrase]);
		const calls = cut(new HeldEndpoint(), stream);
		expect(calls).toHaveLength(1);
		expect(calls[0].raw.length).toBe(stream.length);
	});
});
