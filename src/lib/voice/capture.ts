/**
 * What the capture AudioWorklet does with the microphone, framework-free so Node tests run the
 * same code: collect the render quanta (128 samples) into blocks of about 100 ms, and clean
 * each quantum with RNNoise as it arrives. Suppression so runs while the technician speaks, on
 * the audio thread: when the phrase ends only the decoding is left, and the page's thread stays
 * free for the Bench. Until RNNoise is ready the sound is held back, so no call starts uncleaned.
 */
import type { Denoiser } from './denoise';

/** One block for the page: what the microphone sent, and the same cleaned (null: no cleaning). */
export interface CapturedBlock {
	raw: Float32Array;
	clean: Float32Array | null;
}

export class CaptureCore {
	readonly #raw: Float32Array;
	readonly #clean: Float32Array;
	#filled = 0;
	/** Whether every quantum of the block being filled was cleaned. */
	#allClean = true;
	#denoiser: Denoiser | null = null;
	/**
	 * Quanta held back while the denoiser is on its way (the worklet instantiates RNNoise after
	 * the microphone has started): the first words of a call are cleaned like the rest.
	 */
	#backlog: Float32Array[] | null;
	#backlogSamples = 0;
	readonly #maxBacklog: number;

	/**
	 * @param awaitDenoiser hold the sound back (up to `maxBacklog` samples) until
	 *   `useDenoiser` is called, instead of passing it on uncleaned
	 */
	constructor(
		blockSamples: number,
		{ awaitDenoiser = false, maxBacklog = blockSamples * 30 } = {}
	) {
		this.#raw = new Float32Array(blockSamples);
		this.#clean = new Float32Array(blockSamples);
		this.#backlog = awaitDenoiser ? [] : null;
		this.#maxBacklog = maxBacklog;
	}

	/**
	 * Cleans from now on (null: the denoiser could not start). Sound held back meanwhile goes
	 * through it first; returns the blocks that completes.
	 */
	useDenoiser(denoiser: Denoiser | null): CapturedBlock[] {
		this.#denoiser?.destroy();
		this.#denoiser = denoiser;
		const held = this.#backlog ?? [];
		this.#backlog = null;
		this.#backlogSamples = 0;
		return held.flatMap((q) => this.#take(q));
	}

	get denoising(): boolean {
		return this.#denoiser !== null;
	}

	/**
	 * Drops the block being filled: the next call starts a block of its own, not the tail of the
	 * last one. The denoiser keeps its state (it follows the room's noise).
	 */
	reset() {
		this.#filled = 0;
		this.#allClean = true;
		if (this.#backlog) this.#backlog = [];
		this.#backlogSamples = 0;
	}

	/** Feeds one quantum of the first channel; returns the blocks it completed (usually none). */
	push(channel: Float32Array): CapturedBlock[] {
		if (!this.#backlog) return this.#take(channel);
		this.#backlog.push(channel.slice());
		this.#backlogSamples += channel.length;
		// a denoiser that never comes does not hold the microphone back for long
		return this.#backlogSamples > this.#maxBacklog ? this.useDenoiser(null) : [];
	}

	#take(channel: Float32Array): CapturedBlock[] {
		const clean = this.#denoiser ? this.#denoiser.process(channel) : null;
		const out: CapturedBlock[] = [];
		let i = 0;
		while (i < channel.length) {
			const n = Math.min(channel.length - i, this.#raw.length - this.#filled);
			this.#raw.set(channel.subarray(i, i + n), this.#filled);
			if (clean) this.#clean.set(clean.subarray(i, i + n), this.#filled);
			else this.#allClean = false;
			this.#filled += n;
			i += n;
			if (this.#filled === this.#raw.length) {
				out.push({ raw: this.#raw.slice(), clean: this.#allClean ? this.#clean.slice() : null });
				this.#filled = 0;
				this.#allClean = clean !== null;
			}
		}
		return out;
	}

	destroy() {
		this.#denoiser?.destroy();
		this.#denoiser = null;
		this.#backlog = null;
	}
}
