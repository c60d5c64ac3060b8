/**
 * Where a call begins and ends when the Bench listens hands-free: blocks of about 100 ms come
 * in (raw and after noise suppression), whole utterances go out. Framework-free, so the Bench
 * and `bench:voice` run the same code. Two ways to tell speech from the shop:
 *
 * - `LevelEndpoint`: the suppressed signal's level against a floor learnt between calls;
 * - `VadEndpoint`: soundswallower's `Endpointer` (PocketSphinx's WebRTC-style voice activity
 *   detector with a sliding window), fed the suppressed signal in its own frames.
 *
 * `bench:voice --endpoint=level|vad` measures both on the voice corpus (README, Voice).
 */
import type { SoundSwallowerModule } from 'soundswallower';
import { MAX_PHRASE_SECONDS, SAMPLE_RATE } from './audio';

/** One call as heard: the suppressed samples to decode and the raw ones to judge. */
export interface Utterance {
	clean: Float32Array;
	raw: Float32Array;
}

export interface Endpoint {
	/** Feeds one block; returns the utterance this block ended, if any. */
	push(raw: Float32Array, clean: Float32Array): Utterance | null;
	/** True while a call is being heard (the grammar is not switched then). */
	readonly inSpeech: boolean;
	/** Ends the call being heard now (listening stopped). */
	flush(): Utterance | null;
}

/** Speech ends after this much quiet. */
export const END_SILENCE_MS = 700;
/** A call still going past the longest one is cut here (and refused as too long). */
export const MAX_UTTERANCE_MS = (MAX_PHRASE_SECONDS + 0.5) * 1000;
const PREROLL_BLOCKS = 3;

export function rmsOf(block: Float32Array): number {
	let sum = 0;
	for (let i = 0; i < block.length; i++) sum += block[i] * block[i];
	return block.length ? Math.sqrt(sum / block.length) : 0;
}

export function joined(blocks: Float32Array[]): Float32Array {
	const out = new Float32Array(blocks.reduce((n, b) => n + b.length, 0));
	let at = 0;
	for (const b of blocks) {
		out.set(b, at);
		at += b.length;
	}
	return out;
}

/**
 * Speech is a block louder than four times the floor (and than 0.015 of full scale); the floor
 * follows the quiet blocks between calls. Three blocks before the start are kept.
 */
export class LevelEndpoint implements Endpoint {
	#floor = 0.005;
	#in = false;
	#quietMs = 0;
	#uttMs = 0;
	#clean: Float32Array[] = [];
	#raw: Float32Array[] = [];

	get inSpeech() {
		return this.#in;
	}

	push(raw: Float32Array, clean: Float32Array): Utterance | null {
		const ms = (raw.length / SAMPLE_RATE) * 1000;
		const rms = rmsOf(clean);
		const speech = rms > Math.max(0.015, this.#floor * 4);
		if (!this.#in) {
			if (!speech) {
				this.#floor = this.#floor * 0.95 + rms * 0.05;
				this.#clean.push(clean);
				this.#raw.push(raw);
				if (this.#clean.length > PREROLL_BLOCKS) {
					this.#clean.shift();
					this.#raw.shift();
				}
				return null;
			}
			this.#in = true;
			this.#uttMs = 0;
			this.#quietMs = 0;
		}
		this.#clean.push(clean);
		this.#raw.push(raw);
		this.#uttMs += ms;
		this.#quietMs = speech ? 0 : this.#quietMs + ms;
		return this.#uttMs >= MAX_UTTERANCE_MS || this.#quietMs >= END_SILENCE_MS ? this.flush() : null;
	}

	flush(): Utterance | null {
		if (!this.#in) return null;
		this.#in = false;
		const out = { clean: joined(this.#clean), raw: joined(this.#raw) };
		this.#clean = [];
		this.#raw = [];
		return out;
	}
}

/** Push-to-talk: everything from the key press to its release (or the longest call) is one call. */
export class HeldEndpoint implements Endpoint {
	#on = true;
	#ms = 0;
	#clean: Float32Array[] = [];
	#raw: Float32Array[] = [];

	get inSpeech() {
		return this.#on;
	}

	push(raw: Float32Array, clean: Float32Array): Utterance | null {
		if (!this.#on) return null;
		this.#clean.push(clean);
		this.#raw.push(raw);
		this.#ms += (raw.length / SAMPLE_RATE) * 1000;
		return this.#ms >= MAX_UTTERANCE_MS ? this.flush() : null;
	}

	flush(): Utterance | null {
		if (!this.#on) return null;
		this.#on = false;
		const out = { clean: joined(this.#clean), raw: joined(this.#raw) };
		this.#clean = [];
		this.#raw = [];
		return out;
	}
}

export interface VadOptions {
	/** 0 (lenient) … 3 (strict): the WebRTC detector's aggressiveness. */
	mode?: number;
	/** Seconds of frames the decision looks over. */
	window?: number;
	/** Share of the window's frames that must agree to start or end speech. */
	ratio?: number;
}

/**
 * soundswallower's `Endpointer` decides; the samples are cut from this class's own history by
 * the start and end times it reports, so the raw and the suppressed audio stay aligned.
 */
export class VadEndpoint implements Endpoint {
	readonly #ep: InstanceType<SoundSwallowerModule['Endpointer']>;
	readonly #frame: Float32Array;
	#fill = 0;
	/** Samples fed so far, and the history kept since `#histStart` (a sample index). */
	#fed = 0;
	#histStart = 0;
	#clean: Float32Array[] = [];
	#raw: Float32Array[] = [];
	#startSample = -1;
	/** Set when a call ran past the longest one and was cut: its real end is not reported. */
	#cut = false;

	constructor(ss: SoundSwallowerModule, opts: VadOptions = {}) {
		this.#ep = new ss.Endpointer({
			samprate: SAMPLE_RATE,
			mode: opts.mode ?? 2,
			window: opts.window ?? 0.3,
			ratio: opts.ratio ?? 0.9
		});
		this.#frame = new Float32Array(this.#ep.get_frame_size());
	}

	get inSpeech() {
		return this.#startSample >= 0;
	}

	push(raw: Float32Array, clean: Float32Array): Utterance | null {
		this.#clean.push(clean);
		this.#raw.push(raw);
		this.#fed += clean.length;
		let out: Utterance | null = null;
		for (let i = 0; i < clean.length; i++) {
			// the detector takes 16-bit samples: keep the suppressed signal in range
			this.#frame[this.#fill++] = Math.max(-1, Math.min(1, clean[i]));
			if (this.#fill < this.#frame.length) continue;
			this.#fill = 0;
			const was = this.#ep.get_in_speech();
			this.#ep.process(this.#frame);
			const now = this.#ep.get_in_speech();
			if (!was && now) {
				this.#startSample = Math.max(0, Math.round(this.#ep.get_speech_start() * SAMPLE_RATE));
				this.#cut = false;
			} else if (was && !now) {
				const end = Math.round(this.#ep.get_speech_end() * SAMPLE_RATE);
				if (!this.#cut) out = this.#take(end);
				this.#startSample = -1;
				this.#cut = false;
			}
		}
		if (this.#startSample >= 0 && !this.#cut) {
			const ms = ((this.#fed - this.#startSample) / SAMPLE_RATE) * 1000;
			if (ms >= MAX_UTTERANCE_MS) {
				out = this.#take(this.#fed);
				this.#cut = true;
			}
		}
		if (this.#startSample < 0) this.#trim();
		return out;
	}

	flush(): Utterance | null {
		if (this.#startSample < 0 || this.#cut) return null;
		const out = this.#take(this.#fed);
		this.#startSample = -1;
		return out;
	}

	/** The history from the call's start to `end` (sample indexes of the stream). */
	#take(end: number): Utterance {
		const from = Math.max(0, this.#startSample - this.#histStart);
		const to = Math.max(from, Math.min(this.#fed, end) - this.#histStart);
		return {
			clean: joined(this.#clean).slice(from, to),
			raw: joined(this.#raw).slice(from, to)
		};
	}

	/** Keeps about a second of history while no call is heard (the detector starts calls late). */
	#trim() {
		while (this.#clean.length > 10) {
			this.#histStart += this.#clean[0].length;
			this.#clean.shift();
			this.#raw.shift();
		}
	}
}
