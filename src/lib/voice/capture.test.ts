/**
 * The capture worklet's own code in Node: render quanta of 128 samples become 100 ms blocks,
 * raw as the microphone sent them and cleaned by RNNoise as they arrive, sample for sample what
 * one denoiser fed the whole stream gives; sound that arrives while RNNoise loads waits for it
 * (or, if it never comes, goes on marked uncleaned); a new call drops the last one's unfinished
 * block; and the cleaned blocks of a noisy phrase, joined as the Bench joins them, decode to the
 * call that was said.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import createModule from 'soundswallower';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parsePhrase, type StepSpec } from '../phrase/index';
import { CaptureCore, type CapturedBlock } from './capture';
import { createDecoder, decodePhrase, readWavForModel, useGrammar, type Decoder } from './decoder';
import { createDenoiser, loadRnnoise, type RnnoiseModule } from './denoise';
import { joined } from './endpoint';

const dir = fileURLToPath(new URL('../../../tests/fixtures/voice/', import.meta.url));
const BLOCK = 1600; // 100 ms at 16 kHz, as the worklet makes them
let rnnoise: RnnoiseModule;
let decoder: Decoder;

beforeAll(async () => {
	rnnoise = await loadRnnoise();
	const modelBase = fileURLToPath(
		new URL('../../../node_modules/soundswallower/model/', import.meta.url)
	);
	decoder = await createDecoder(await createModule({ modelBase } as never));
}, 30_000);
afterAll(() => decoder?.delete());

/** Feeds `samples` to the core in render quanta, as the audio thread does. */
function capture(core: CaptureCore, samples: Float32Array, quantum = 128): CapturedBlock[] {
	const out: CapturedBlock[] = [];
	for (let at = 0; at < samples.length; at += quantum)
		out.push(...core.push(samples.subarray(at, at + quantum)));
	return out;
}

describe('capture worklet core', () => {
	const speech = readWavForModel(readFileSync(dir + 'noisy-rear-axle-92-nm.wav'));

	it('makes whole 100 ms blocks; the raw ones are the input, the clean ones one stream’s output', () => {
		const core = new CaptureCore(BLOCK);
		core.useDenoiser(createDenoiser(rnnoise));
		const blocks = capture(core, speech);
		core.destroy();
		const whole = Math.floor(speech.length / BLOCK);
		expect(blocks).toHaveLength(whole);
		expect(blocks.every((b) => b.raw.length === BLOCK && b.clean?.length === BLOCK)).toBe(true);
		expect(Array.from(joined(blocks.map((b) => b.raw)))).toEqual(
			Array.from(speech.subarray(0, whole * BLOCK))
		);
		const reference = createDenoiser(rnnoise);
		const expected = reference.process(speech).subarray(0, whole * BLOCK);
		reference.destroy();
		expect(Array.from(joined(blocks.map((b) => b.clean!)))).toEqual(Array.from(expected));
	});

	it('a new call starts a block of its own: reset drops the last call’s unfinished block', () => {
		const core = new CaptureCore(BLOCK);
		core.useDenoiser(createDenoiser(rnnoise));
		// the last call stopped 60 ms into a block
		expect(capture(core, speech.subarray(0, 128 * 7.5))).toEqual([]);
		core.reset();
		const next = speech.subarray(BLOCK * 3, BLOCK * 5);
		const blocks = capture(core, next);
		core.destroy();
		expect(blocks).toHaveLength(2);
		expect(Array.from(blocks[0].raw)).toEqual(Array.from(next.subarray(0, BLOCK)));
		expect(Array.from(blocks[1].raw)).toEqual(Array.from(next.subarray(BLOCK)));
		expect(blocks.every((b) => b.clean !== null)).toBe(true);
	});

	it('reset also drops sound held back for a denoiser that has not come', () => {
		const core = new CaptureCore(BLOCK, { awaitDenoiser: true });
		capture(core, speech.subarray(0, BLOCK / 2));
		core.reset();
		const next = speech.subarray(BLOCK * 2, BLOCK * 3);
		capture(core, next);
		const blocks = core.useDenoiser(createDenoiser(rnnoise));
		core.destroy();
		expect(blocks).toHaveLength(1);
		expect(Array.from(blocks[0].raw)).toEqual(Array.from(next));
	});

	it('marks blocks uncleaned until suppression starts, whatever the quantum', () => {
		const core = new CaptureCore(BLOCK);
		// 1.5 blocks before the denoiser arrives (the worklet instantiates it asynchronously)
		const first = capture(core, speech.subarray(0, 2400), 100);
		core.useDenoiser(createDenoiser(rnnoise));
		const rest = capture(core, speech.subarray(2400, 8000), 100);
		core.destroy();
		expect(first.map((b) => b.clean)).toEqual([null]);
		// the block that straddles the start is not clean; the ones after it are
		expect(rest.map((b) => b.clean === null)).toEqual([true, false, false, false]);
		expect(core.denoising).toBe(false);
	});

	it('holds the sound back while RNNoise loads, then cleans it all as one stream', () => {
		const core = new CaptureCore(BLOCK, { awaitDenoiser: true });
		const early = capture(core, speech.subarray(0, 4000));
		expect(early).toEqual([]);
		const blocks = core.useDenoiser(createDenoiser(rnnoise));
		blocks.push(...capture(core, speech.subarray(4000, 8000)));
		core.destroy();
		expect(blocks).toHaveLength(5);
		const reference = createDenoiser(rnnoise);
		const expected = reference.process(speech.subarray(0, 8000));
		reference.destroy();
		expect(Array.from(joined(blocks.map((b) => b.clean!)))).toEqual(Array.from(expected));
	});

	it('passes the sound on uncleaned when RNNoise does not come in time', () => {
		const core = new CaptureCore(BLOCK, { awaitDenoiser: true, maxBacklog: 3 * BLOCK });
		const blocks = capture(core, speech.subarray(0, 8000));
		core.destroy();
		expect(blocks.length).toBeGreaterThanOrEqual(3);
		expect(blocks.every((b) => b.clean === null)).toBe(true);
		expect(Array.from(joined(blocks.map((b) => b.raw)))).toEqual(
			Array.from(speech.subarray(0, blocks.length * BLOCK))
		);
	});

	it('decodes the joined clean blocks of a noisy phrase to the call said', () => {
		const manifest = JSON.parse(readFileSync(dir + 'manifest.json', 'utf8')) as {
			jobs: Record<string, Omit<StepSpec, 'id'>[]>;
		};
		const steps = manifest.jobs['1041'].map((s) => ({ ...s, id: s.label }));
		useGrammar(decoder, { steps });
		const core = new CaptureCore(BLOCK);
		core.useDenoiser(createDenoiser(rnnoise));
		// a little quiet after the phrase, as the endpointer leaves it
		const padded = new Float32Array(speech.length + 8000);
		padded.set(speech);
		const clean = joined(capture(core, padded).map((b) => b.clean!));
		core.destroy();
		const heard = decodePhrase(decoder, clean);
		const parsed = parsePhrase(heard.text, { steps });
		// manifest.json: "rear axle nut ninety two newton metres" under noise
		expect(parsed.stepId).toBe('Rear axle nut');
		expect(parsed.quantity).toMatchObject({ value: 92, unit: 'N.m' });
	});
});
