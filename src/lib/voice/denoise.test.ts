/**
 * RNNoise around the ×3 resampler: the output keeps the input's length and timing, a stream
 * fed in blocks gives the same samples as the whole phrase at once, and steady noise comes out
 * much quieter while speech stays.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { readWavForModel } from './audio';
import { createDenoiser, denoisePhrase, loadRnnoise, type RnnoiseModule } from './denoise';

const dir = fileURLToPath(new URL('../../../tests/fixtures/voice/', import.meta.url));
let mod: RnnoiseModule;
beforeAll(async () => {
	mod = await loadRnnoise();
});

const rms = (x: Float32Array, from = 0, to = x.length) => {
	let s = 0;
	for (let i = from; i < to; i++) s += x[i] * x[i];
	return Math.sqrt(s / Math.max(1, to - from));
};

/** Repeatable white noise (a linear congruential generator, Park–Miller constants). */
function noise(n: number, level: number): Float32Array {
	const out = new Float32Array(n);
	let s = 12345;
	for (let i = 0; i < n; i++) {
		s = (s * 16807) % 2147483647;
		out[i] = (s / 2147483647 - 0.5) * 2 * level;
	}
	return out;
}

describe('denoise', () => {
	it('keeps length, and a stream in blocks equals one whole call', () => {
		const speech = readWavForModel(readFileSync(dir + 'noisy-rear-axle-92-nm.wav'));
		const whole = createDenoiser(mod);
		const a = whole.process(speech);
		whole.destroy();
		const blocks = createDenoiser(mod);
		const parts: Float32Array[] = [];
		for (let at = 0; at < speech.length; at += 128)
			parts.push(blocks.process(speech.subarray(at, at + 128)));
		blocks.destroy();
		const b = new Float32Array(speech.length);
		let at = 0;
		for (const p of parts) {
			b.set(p, at);
			at += p.length;
		}
		expect(a.length).toBe(speech.length);
		expect(at).toBe(speech.length);
		expect(Array.from(b.subarray(0, 2000))).toEqual(Array.from(a.subarray(0, 2000)));
		expect(rms(b)).toBeCloseTo(rms(a), 6);
	});

	it('takes steady noise down by more than 10 dB and keeps a tone-free signal finite', () => {
		const n = noise(16000 * 2, 0.05);
		const out = denoisePhrase(mod, n);
		expect(out.length).toBe(n.length);
		// skip the first half second while RNNoise learns the noise
		const before = rms(n, 8000);
		const after = rms(out, 8000);
		expect(20 * Math.log10(after / before)).toBeLessThan(-10);
		expect(out.every(Number.isFinite)).toBe(true);
	});

	it('keeps the speech of a phrase (its level within 6 dB)', () => {
		const speech = readWavForModel(readFileSync(dir + 'rear-axle-88-nm.wav'));
		const out = denoisePhrase(mod, speech);
		const ratio = 20 * Math.log10(rms(out) / rms(speech));
		expect(Math.abs(ratio)).toBeLessThan(6);
	});

	it('refuses to work after destroy', () => {
		const d = createDenoiser(mod);
		d.destroy();
		expect(() => d.process(new Float32Array(10))).toThrow(/closed/);
	});
});
