/**
 * Noise suppression before decoding: RNNoise (`@jitsi/rnnoise-wasm`, its model compiled in)
 * cleans 16 kHz speech the way the recogniser hears it. RNNoise works on 480-sample frames at
 * 48 kHz with samples scaled to ±32768, so the audio is resampled 16 kHz → 48 kHz (×3, a
 * windowed-sinc low-pass), cleaned frame by frame and brought back to 16 kHz the same way.
 *
 * Framework-free: the same code runs in Node (tests, `bench:voice`) and in the browser's
 * capture AudioWorklet. The WASM module is passed in (`loadRnnoise()` makes one in either).
 * A denoiser keeps its state between calls, so a worklet can feed it block by block.
 */

/** What this code needs of the Emscripten module. */
export interface RnnoiseModule {
	_rnnoise_create(model: number): number;
	_rnnoise_destroy(state: number): void;
	_rnnoise_process_frame(state: number, out: number, input: number): number;
	_malloc(bytes: number): number;
	_free(pointer: number): void;
	HEAPF32: Float32Array;
}

export interface Denoiser {
	/**
	 * Cleans the next block of 16 kHz samples (−1…1) and returns as many samples as it was
	 * given, delayed by `latencySamples` (zeros at the very start).
	 */
	process(samples16k: Float32Array): Float32Array;
	/** Frees the WASM state; the denoiser cannot be used afterwards. */
	destroy(): void;
	/** The fixed delay of the output behind the input, in 16 kHz samples. */
	readonly latencySamples: number;
	/** RNNoise's voice probability (0…1) for the last whole frame it cleaned. */
	readonly voiceProbability: number;
}

/** Loads the RNNoise module; works in Node and in the browser (the WASM is inlined). */
export async function loadRnnoise(): Promise<RnnoiseModule> {
	const { default: create } = await import('@jitsi/rnnoise-wasm/dist/rnnoise-sync.js');
	const mod = create();
	await mod.ready;
	return mod as RnnoiseModule;
}

const FACTOR = 3; // 48 kHz / 16 kHz
const FRAME = 480; // RNNoise's frame: 10 ms at 48 kHz
const TAPS = 72; // low-pass length at 48 kHz (24 per phase)
const SCALE = 32768;

/**
 * A windowed-sinc low-pass (Blackman window) at 48 kHz, cut at 6.5 kHz: the model listens
 * below 3.7 kHz (its `upperf`), so a gentle filter keeps speech and drops the images and
 * aliases of the ×3 resampling.
 */
function lowPass(): Float64Array {
	const fc = 6500 / 48000;
	const h = new Float64Array(TAPS);
	const mid = (TAPS - 1) / 2;
	let sum = 0;
	for (let i = 0; i < TAPS; i++) {
		const x = i - mid;
		const sinc = x === 0 ? 2 * fc : Math.sin(2 * Math.PI * fc * x) / (Math.PI * x);
		const w =
			0.42 -
			0.5 * Math.cos((2 * Math.PI * i) / (TAPS - 1)) +
			0.08 * Math.cos((4 * Math.PI * i) / (TAPS - 1));
		h[i] = sinc * w;
		sum += h[i];
	}
	for (let i = 0; i < TAPS; i++) h[i] /= sum;
	return h;
}
const H = lowPass();
const PHASE = TAPS / FACTOR;
/** Group delay of both filters, in 16 kHz samples, rounded. */
const FILTER_DELAY = Math.round((2 * ((TAPS - 1) / 2)) / FACTOR);

export function createDenoiser(mod: RnnoiseModule): Denoiser {
	const state = mod._rnnoise_create(0);
	if (!state) throw new Error('Noise suppression could not start (RNNoise gave no state).');
	const buf = mod._malloc(FRAME * 4);
	if (!buf) {
		mod._rnnoise_destroy(state);
		throw new Error('Noise suppression could not start (no memory for a frame).');
	}
	// up-sampler history: the last PHASE input samples, newest first at `upAt`
	const upHist = new Float64Array(PHASE);
	let upAt = 0;
	// one frame of 48 kHz samples waiting for RNNoise
	const frame = new Float32Array(FRAME);
	let frameFill = 0;
	// down-sampler history: the last TAPS cleaned 48 kHz samples (ring) and the phase count
	const downHist = new Float64Array(TAPS);
	let downAt = 0;
	let downPhase = 0;
	// cleaned 16 kHz samples not yet handed out; starts with one frame of zeros so every call
	// can return as many samples as it was given
	let queue = new Float32Array(4096);
	let qHead = 0;
	let qTail = FRAME / FACTOR;
	let vad = 0;
	let alive = true;

	const pushOut = (v: number) => {
		if (qTail === queue.length) {
			const live = queue.subarray(qHead, qTail);
			const next = new Float32Array(Math.max(4096, live.length * 2));
			next.set(live);
			queue = next;
			qTail = live.length;
			qHead = 0;
		}
		queue[qTail++] = v;
	};

	const down = (v: number) => {
		downHist[downAt] = v;
		downAt = (downAt + 1) % TAPS;
		if (++downPhase < FACTOR) return;
		downPhase = 0;
		// y = Σ h[i]·d[n−i]; the newest sample sits just before downAt
		let acc = 0;
		let at = downAt;
		for (let i = 0; i < TAPS; i++) {
			at = at === 0 ? TAPS - 1 : at - 1;
			acc += H[i] * downHist[at];
		}
		pushOut(acc);
	};

	const runFrame = () => {
		const heap = mod.HEAPF32;
		const base = buf >> 2;
		for (let i = 0; i < FRAME; i++) heap[base + i] = frame[i] * SCALE;
		vad = mod._rnnoise_process_frame(state, buf, buf);
		const out = mod.HEAPF32; // the heap may have grown
		for (let i = 0; i < FRAME; i++) down(out[base + i] / SCALE);
		frameFill = 0;
	};

	return {
		latencySamples: FRAME / FACTOR + FILTER_DELAY,
		get voiceProbability() {
			return vad;
		},
		process(samples16k: Float32Array): Float32Array {
			if (!alive) throw new Error('This noise suppressor was already closed.');
			for (let n = 0; n < samples16k.length; n++) {
				const x = samples16k[n];
				upAt = upAt === 0 ? PHASE - 1 : upAt - 1;
				upHist[upAt] = Number.isFinite(x) ? Math.max(-1, Math.min(1, x)) : 0;
				// y[3n+k] = 3·Σ_j h[k+3j]·x[n−j]
				for (let k = 0; k < FACTOR; k++) {
					let acc = 0;
					for (let j = 0; j < PHASE; j++) acc += H[k + FACTOR * j] * upHist[(upAt + j) % PHASE];
					frame[frameFill++] = acc * FACTOR;
				}
				if (frameFill === FRAME) runFrame();
			}
			const out = queue.slice(qHead, qHead + samples16k.length);
			qHead += samples16k.length;
			if (qHead === qTail) qHead = qTail = 0;
			return out;
		},
		destroy() {
			if (!alive) return;
			alive = false;
			mod._free(buf);
			mod._rnnoise_destroy(state);
		}
	};
}

/**
 * Cleans a whole recorded phrase with a fresh denoiser and returns it aligned with the input
 * (the delay removed, same length).
 */
export function denoisePhrase(mod: RnnoiseModule, samples: Float32Array): Float32Array {
	const d = createDenoiser(mod);
	try {
		const padded = new Float32Array(samples.length + d.latencySamples);
		padded.set(samples);
		return d.process(padded).subarray(d.latencySamples);
	} finally {
		d.destroy();
	}
}
