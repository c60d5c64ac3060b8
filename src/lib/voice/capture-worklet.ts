// The capture AudioWorklet of offline voice, on the audio thread: it cleans the microphone with
// RNNoise as the samples arrive (capture.ts, the code the Node tests run) and posts blocks of
// about 100 ms to the page, each with its raw samples, which the silence and clipping checks
// judge. Vite bundles this file with its imports (`?worker&url`, one file per deploy).
import createRNNWasmModule from '@jitsi/rnnoise-wasm/dist/rnnoise.js';
import { CaptureCore, type CapturedBlock } from './capture';
import { createDenoiser, type RnnoiseModule } from './denoise';

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

interface CaptureOptions {
	processorOptions?: { rnnoiseWasm?: ArrayBuffer };
}

class BenchcallCapture extends AudioWorkletProcessor {
	readonly #core: CaptureCore;

	constructor(options: CaptureOptions = {}) {
		super();
		const wasm = options.processorOptions?.rnnoiseWasm;
		this.#core = new CaptureCore(Math.round(sampleRate / 10), { awaitDenoiser: !!wasm });
		if (wasm) void this.#startDenoiser(wasm);
		else this.#post({ kind: 'denoise', ok: false, message: 'No noise suppression was given.' });
	}

	async #startDenoiser(wasm: ArrayBuffer) {
		try {
			const mod = await createRNNWasmModule({
				// the page fetched the WASM (the audio thread cannot); instantiate it here
				instantiateWasm: (
					imports: WebAssembly.Imports,
					receive: (instance: WebAssembly.Instance) => void
				) => {
					void WebAssembly.instantiate(wasm, imports).then((r) => receive(r.instance));
					return {};
				}
			});
			await mod.ready;
			this.#post({ kind: 'denoise', ok: true });
			this.#postBlocks(this.#core.useDenoiser(createDenoiser(mod as RnnoiseModule)));
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
