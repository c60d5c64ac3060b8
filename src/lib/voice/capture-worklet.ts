// The capture AudioWorklet of offline voice, on the audio thread: it cleans the microphone with
// RNNoise as the samples arrive (capture.ts, the code the Node tests run) and posts blocks of
// about 100 ms to the page, each with its raw samples, which the silence and clipping checks
// judge. Vite bundles this file with its imports (`?worker&url`, one file per deploy).
//
// RNNoise comes from the same build as in Node (`loadRnnoise` in denoise.ts): rnnoise-sync.js,
// RNNoise 0.2 with its WASM inlined. The package's other build (rnnoise.js with rnnoise.wasm) is
// RNNoise 0.1, an older model that cleans differently: with it the Bench heard a noisy "ninety"
// as "nineteen", which the tests, on 0.2, could not see. tests/voice-worklet.spec.ts checks that
// this worklet cleans a phrase as the Node code does.
import createRNNWasmModuleSync from '@jitsi/rnnoise-wasm/dist/rnnoise-sync.js';
import { CaptureCore, type CapturedBlock } from './capture';
import { createDenoiser } from './denoise';

/** The AudioWorkletGlobalScope's names, which TypeScript's libraries do not describe. */
declare const sampleRate: number;
declare function registerProcessor(name: string, ctor: unknown): void;
declare class AudioWorkletProcessor {
	readonly port: MessagePort;
}

/** What the page hears from the worklet. */
export type CaptureMessage =
	| { kind: 'block'; raw: Float32Array; clean: Float32Array | null }
	| { kind: 'denoise'; ok: boolean; message?: string };

/** What the page tells the worklet: a new call begins (the worklet is kept between calls). */
export type CaptureCommand = { kind: 'reset' };

class BenchcallCapture extends AudioWorkletProcessor {
	readonly #core: CaptureCore;

	constructor() {
		super();
		this.#core = new CaptureCore(Math.round(sampleRate / 10), { awaitDenoiser: true });
		this.port.onmessage = (e: MessageEvent<CaptureCommand>) => {
			if (e.data.kind === 'reset') this.#core.reset();
		};
		void this.#startDenoiser();
	}

	async #startDenoiser() {
		try {
			const mod = createRNNWasmModuleSync();
			await mod.ready;
			this.#postBlocks(this.#core.useDenoiser(createDenoiser(mod)));
			this.#post({ kind: 'denoise', ok: true });
		} catch (e) {
			this.#postBlocks(this.#core.useDenoiser(null));
			this.#post({
				kind: 'denoise',
				ok: false,
				message: e instanceof Error ? e.message : String(e)
			});
		}
	}

	#post(message: CaptureMessage) {
		this.port.postMessage(message);
	}

	#postBlocks(blocks: CapturedBlock[]) {
		for (const b of blocks) this.#post({ kind: 'block', ...b });
	}

	process(inputs: Float32Array[][]): boolean {
		const channel = inputs[0]?.[0];
		if (channel) this.#postBlocks(this.#core.push(channel));
		return true;
	}
}

registerProcessor('benchcall-capture', BenchcallCapture);
