/**
 * The Bench's capture worklet cleans the microphone with the same RNNoise the voice tests and
 * `bench:voice` measure in Node. The package ships two builds with different models (0.1 and
 * 0.2); the worklet once loaded the other one, and every figure measured in Node was then not
 * what the Bench heard. Here the built worklet cleans a noisy phrase in Chromium, rendered
 * offline (no real-time clock, so a busy machine cannot change the result), and its output is
 * compared with capture.ts and denoise.ts run in Node on the same samples.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
import { readWavForModel } from '../src/lib/voice/audio';
import { CaptureCore } from '../src/lib/voice/capture';
import { createDenoiser, loadRnnoise } from '../src/lib/voice/denoise';
import { joined } from '../src/lib/voice/endpoint';

const BLOCK = 1600; // the worklet's block at 16 kHz: 100 ms
const QUANTUM = 128; // Web Audio's render quantum

/** The capture worklet of the build the tests run against, as the Bench loads it. */
function workletPath(): string {
	const dir = new URL('../build/client/_app/immutable/workers/', import.meta.url);
	const file = readdirSync(dir).find((f) => /^capture-worklet-.*\.js$/.test(f));
	if (!file) throw new Error('No capture worklet in the build: run the build first.');
	return `/_app/immutable/workers/${file}`;
}

/** The same samples through the Node code, a quantum at a time as the audio thread gives them. */
async function cleanInNode(samples: Float32Array): Promise<Float32Array> {
	const core = new CaptureCore(BLOCK);
	core.useDenoiser(createDenoiser(await loadRnnoise()));
	const out: Float32Array[] = [];
	for (let at = 0; at + QUANTUM <= samples.length; at += QUANTUM)
		for (const b of core.push(samples.subarray(at, at + QUANTUM))) out.push(b.clean!);
	core.destroy();
	return joined(out);
}

/** Energy of the difference against the energy of the reference, in dB. */
function differenceDb(reference: Float32Array, other: Float32Array): number {
	let diff = 0;
	let energy = 0;
	for (let i = 0; i < reference.length; i++) {
		diff += (reference[i] - other[i]) ** 2;
		energy += reference[i] ** 2;
	}
	return diff === 0 ? -Infinity : 10 * Math.log10(diff / energy);
}

test('the capture worklet cleans a noisy phrase as the Node code the tests measure does', async ({
	page
}) => {
	const wav = readFileSync(
		new URL('./fixtures/voice/e2e/noisy-pink-10db-rear-axle-90-nm.wav', import.meta.url)
	);
	// whole render quanta, so the worklet and Node see the same samples
	const all = readWavForModel(wav);
	const samples = all.subarray(0, all.length - (all.length % QUANTUM));
	// any page of the app: the worklet runs under the app's own content security policy
	await page.goto('/sign-in');
	const fromBrowser = await page.evaluate(
		async ({ url, input, block }) => {
			const data = Float32Array.from(input);
			const ctx = new OfflineAudioContext(1, data.length, 16000);
			await ctx.audioWorklet.addModule(url);
			const node = new AudioWorkletNode(ctx, 'benchcall-capture');
			const clean: number[][] = [];
			let uncleaned = 0;
			let denoise: unknown = null;
			node.port.onmessage = (e) => {
				const m = e.data as
					{ kind: 'block'; clean: Float32Array | null } | { kind: 'denoise'; ok: boolean };
				if (m.kind === 'denoise') denoise = m;
				else if (m.clean) clean.push(Array.from(m.clean));
				else uncleaned++;
			};
			const buffer = ctx.createBuffer(1, data.length, 16000);
			buffer.copyToChannel(data, 0);
			const source = ctx.createBufferSource();
			source.buffer = buffer;
			source.connect(node).connect(ctx.destination);
			source.start();
			await ctx.startRendering();
			// the blocks cross from the audio thread as messages: wait for the last of them
			const want = Math.floor(data.length / block);
			for (let i = 0; i < 100 && clean.length + uncleaned < want; i++)
				await new Promise((r) => setTimeout(r, 50));
			return { clean: clean.flat(), uncleaned, denoise };
		},
		{ url: workletPath(), input: Array.from(samples), block: BLOCK }
	);
	expect(fromBrowser.denoise).toEqual({ kind: 'denoise', ok: true });
	expect(fromBrowser.uncleaned).toBe(0);
	const inNode = await cleanInNode(samples);
	expect(fromBrowser.clean.length).toBe(inNode.length);
	const db = differenceDb(inNode, Float32Array.from(fromBrowser.clean));
	console.log(`worklet against Node: difference ${db.toFixed(1)} dB`);
	// the same code on the same WASM differs by rounding at most; RNNoise 0.1 against 0.2 on
	// this phrase differs by about +2.6 dB (more than the signal itself)
	expect(db).toBeLessThan(-60);
});
