/**
 * The offline recogniser in the browser: soundswallower (PocketSphinx in WASM) with a grammar
 * built from the current job, fed from the microphone through an AudioWorklet. Nothing leaves
 * the device. The package is imported only when offline voice is switched on, so neither SSR
 * nor a Bench without it ever loads the WASM or the 10 MB model.
 */
import type { Recogniser, RecogniserEvents, RecogniserFactory } from './recogniser';
import type { Decoder } from './decoder';
import type { GrammarInput } from './grammar';
import { MAX_PHRASE_SECONDS, checkPhraseAudio } from './audio';

/** Where scripts/lib/voice-model-plugin.js serves the model, the WASM and the worklet. */
export const VOICE_BASE = '/voice-model/';
const MODEL_FILES = [
	'en-us/feat_params.json',
	'en-us/mdef',
	'en-us/transition_matrices',
	'en-us/means',
	'en-us/variances',
	'en-us/sendump',
	'en-us/dict.txt',
	'en-us/noisedict.txt'
];
const SAMPLE_RATE = 16000;
/** Speech ends after this much quiet (ms) when listening hands-free. */
const END_SILENCE_MS = 700;
/** A phrase still going past the longest call is cut here and refused as too long. */
const MAX_UTTERANCE_MS = (MAX_PHRASE_SECONDS + 0.5) * 1000;
const PREROLL_BLOCKS = 3;
/** A microphone that sends only zeros this long is called out once (muted or unplugged). */
const DEAD_MIC_MS = 3000;

/** Noise suppression run on each block before the endpointer and the decoder. */
export interface BlockDenoiser {
	process(samples16k: Float32Array): Float32Array;
	destroy(): void;
}

export type OfflineState = 'off' | 'loading' | 'ready' | 'error';

export class OfflineVoice {
	state = $state<OfflineState>('off');
	/** 0…1 while the model loads. */
	progress = $state(0);
	message = $state('');
	/** Words of the job the model cannot say: their phrases were left out of the grammar. */
	missing = $state<string[]>([]);
	loadMs = $state<number | null>(null);
	/**
	 * How long the last phrase took to read (ms): its noise suppression (done block by block
	 * while it was spoken) plus its decoding. Shown so a slow device is noticed.
	 */
	decodeMs = $state<number | null>(null);
	/** True when noise suppression runs before the decoder. */
	denoising = $state(false);
	/** Microphone level 0…1 while listening. */
	level = $state(0);
	listening = $state(false);
	/** Push-to-talk: one phrase from start() to stop(); otherwise phrases end at a pause. */
	pushToTalk = false;

	#decoder: Decoder | null = null;
	#loading: Promise<void> | null = null;
	#job: GrammarInput = { steps: [] };
	#jobKey = '';
	#appliedKey: string | null = null;

	/** True when this browser has what offline voice needs. */
	static supported(win: Record<string, unknown> = globalThis as never): boolean {
		const nav = win.navigator as Navigator | undefined;
		return (
			typeof win.WebAssembly === 'object' &&
			typeof win.AudioWorkletNode === 'function' &&
			typeof nav?.mediaDevices?.getUserMedia === 'function'
		);
	}

	/** The job's words; the grammar is rebuilt when they change (now, or once loaded). */
	setJob(job: GrammarInput) {
		const key = JSON.stringify(job);
		if (key === this.#jobKey) return;
		this.#job = job;
		this.#jobKey = key;
		if (!this.#inUtterance) this.#applyGrammar();
	}

	#applyGrammar() {
		if (!this.#decoder || this.#appliedKey === this.#jobKey) return;
		const { useGrammar } = this.#grammarTools!;
		const g = useGrammar(this.#decoder, this.#job);
		this.missing = g.missing;
		this.#appliedKey = this.#jobKey;
	}

	#grammarTools: typeof import('./decoder') | null = null;

	/** Loads the WASM and the model (once); the browser's cache serves later loads. */
	load(): Promise<void> {
		this.#loading ??= this.#load().catch((e) => {
			this.state = 'error';
			this.message =
				'Offline voice could not load: ' + (e instanceof Error ? e.message : String(e));
			this.#loading = null;
		});
		return this.#loading;
	}

	async #load() {
		const t0 = performance.now();
		this.state = 'loading';
		this.progress = 0;
		this.message = '';
		// Fetch the files first, for a progress bar; the decoder's own reads then come from the cache.
		// plain maps: only `progress` is shown
		const sizes = new Map<string, number>(); // eslint-disable-line svelte/prefer-svelte-reactivity
		const done = new Map<string, number>(); // eslint-disable-line svelte/prefer-svelte-reactivity
		const tick = () => {
			const total = [...sizes.values()].reduce((a, b) => a + b, 0) || 1;
			const got = [...done.values()].reduce((a, b) => a + b, 0);
			this.progress = Math.min(0.95, (got / total) * (sizes.size / MODEL_FILES.length));
		};
		await Promise.all(
			MODEL_FILES.map(async (f) => {
				const res = await fetch(VOICE_BASE + f);
				if (!res.ok || !res.body) throw new Error(`${f}: the server answered ${res.status}`);
				sizes.set(f, Number(res.headers.get('content-length')) || 1);
				const reader = res.body.getReader();
				let n = 0;
				for (;;) {
					const { done: end, value } = await reader.read();
					if (end) break;
					n += value.byteLength;
					done.set(f, n);
					if (n > (sizes.get(f) ?? 0)) sizes.set(f, n);
					tick();
				}
			})
		);
		const [{ default: createModule }, tools, denoiser] = await Promise.all([
			import('soundswallower'),
			import('./decoder'),
			loadDenoiser()
		]);
		this.#makeDenoiser = denoiser;
		this.denoising = denoiser !== null;
		this.#grammarTools = tools;
		const ss = await createModule({
			locateFile: () => VOICE_BASE + 'soundswallower.wasm',
			modelBase: VOICE_BASE
		} as never);
		this.#decoder = await tools.createDecoder(ss);
		this.#appliedKey = null;
		this.#applyGrammar();
		this.progress = 1;
		this.loadMs = Math.round(performance.now() - t0);
		this.state = 'ready';
	}

	// --- listening ------------------------------------------------------------------------------

	#stream: MediaStream | null = null;
	#ctx: AudioContext | null = null;
	#events: RecogniserEvents | null = null;
	#inUtterance = false;
	#uttMs = 0;
	#quietMs = 0;
	#floor = 0.005;
	#preroll: Float32Array[] = [];
	#prerollRaw: Float32Array[] = [];
	/** The phrase's audio: decoded whole at its end, with the utterance's own normalisation. */
	#utterance: Float32Array[] = [];
	/** The phrase's raw blocks: silence and clipping are judged before suppression. */
	#raw: Float32Array[] = [];
	/** Time spent suppressing noise in the phrase's blocks (ms). */
	#denoiseMs = 0;
	#deadMs = 0;
	#denoiser: BlockDenoiser | null = null;
	/** Made when the model loads; a fresh one per listening session (RNNoise keeps state). */
	#makeDenoiser: (() => BlockDenoiser) | null = null;

	async #listen(events: RecogniserEvents) {
		if (this.listening) return;
		this.#events = events;
		this.listening = true;
		try {
			this.#stream = await navigator.mediaDevices.getUserMedia({
				// the model hears best the plain signal: the browser's noise suppression and gain
				// control leave artefacts it was not trained on (push-to-talk and a close microphone
				// are the remedy for a noisy workshop)
				audio: {
					channelCount: 1,
					echoCancellation: false,
					noiseSuppression: false,
					autoGainControl: false
				}
			});
			this.#denoiser = this.#makeDenoiser?.() ?? null;
			const ctx = new AudioContext({ sampleRate: SAMPLE_RATE });
			this.#ctx = ctx;
			if (ctx.state === 'suspended') {
				// hands-free restored on a fresh page: the browser lets sound run after a first touch
				const wake = () => void ctx.resume();
				addEventListener('pointerdown', wake, { once: true });
				addEventListener('keydown', wake, { once: true });
			}
			await ctx.audioWorklet.addModule(VOICE_BASE + 'capture-worklet.js');
			const source = ctx.createMediaStreamSource(this.#stream);
			const node = new AudioWorkletNode(ctx, 'benchcall-capture');
			const mute = ctx.createGain();
			mute.gain.value = 0;
			source.connect(node).connect(mute).connect(ctx.destination);
			node.port.onmessage = (e: MessageEvent<Float32Array>) => this.#onBlock(e.data);
			if (this.pushToTalk) this.#begin();
		} catch (e) {
			const name = e instanceof DOMException ? e.name : '';
			events.onError(
				name === 'NotAllowedError'
					? 'The microphone is blocked for this site: allow it in the browser’s settings.'
					: name === 'NotFoundError'
						? 'No microphone was found.'
						: 'The microphone could not start: ' + (e instanceof Error ? e.message : String(e))
			);
			this.#teardown();
		}
	}

	#begin() {
		this.#applyGrammar();
		this.#inUtterance = true;
		this.#uttMs = 0;
		this.#quietMs = 0;
		this.#utterance = this.#preroll;
		this.#preroll = [];
		this.#raw = this.#prerollRaw;
		this.#prerollRaw = [];
	}

	#end() {
		if (!this.#inUtterance || !this.#decoder) return;
		this.#inUtterance = false;
		const blocks = this.#utterance;
		this.#utterance = [];
		const denoiseMs = this.#denoiseMs;
		this.#denoiseMs = 0;
		const problem = checkPhraseAudio(joined(this.#raw));
		this.#raw = [];
		if (problem) {
			// never decoded, so never logged: the Bench shows why
			this.#events?.onInterim('');
			this.#events?.onUnread?.(problem.message, problem.problem);
			this.#applyGrammar();
			return;
		}
		const samples = joined(blocks);
		// whole-phrase decoding, as in the Node test and benchmark (about 0.1–0.25 s a phrase)
		const t0 = performance.now();
		const heard = this.#grammarTools!.decodePhrase(this.#decoder, samples);
		this.decodeMs = Math.round(performance.now() - t0 + denoiseMs);
		this.#events?.onInterim('');
		if (heard.text)
			this.#events?.onFinal([{ text: heard.text, confidence: heard.confidence, offline: true }]);
		else
			this.#events?.onUnread?.(
				'Nothing this job knows was heard: say it again, close to the microphone.',
				'nothing'
			);
		// a grammar for a job changed while speaking
		this.#applyGrammar();
	}

	#onBlock(raw: Float32Array) {
		const ms = (raw.length / SAMPLE_RATE) * 1000;
		const rawRms = rmsOf(raw);
		// the meter shows what the microphone sends, before suppression
		this.level = Math.min(1, Math.max(rawRms * 6, this.level * 0.7));
		// only a microphone that has sent nothing but zeros since listening began is called dead
		// (a quiet room still has a little noise; recorded digital silence later on is not a fault)
		this.#deadMs = rawRms === 0 && this.#deadMs >= 0 ? this.#deadMs + ms : -1;
		if (this.#deadMs >= DEAD_MIC_MS && this.#deadMs - ms < DEAD_MIC_MS) {
			this.#events?.onUnread?.(
				'The microphone sends no sound at all: check it is switched on and not muted.',
				'silent'
			);
		}
		let block = raw;
		if (this.#denoiser) {
			const t0 = performance.now();
			block = this.#denoiser.process(raw);
			if (this.#inUtterance) this.#denoiseMs += performance.now() - t0;
		}
		const rms = rmsOf(block);
		const speech = rms > Math.max(0.015, this.#floor * 4);
		if (!speech && !this.#inUtterance) this.#floor = this.#floor * 0.95 + rms * 0.05;
		if (!this.#inUtterance) {
			if (this.pushToTalk || !speech) {
				this.#preroll.push(block);
				this.#prerollRaw.push(raw);
				if (this.#preroll.length > PREROLL_BLOCKS) {
					this.#preroll.shift();
					this.#prerollRaw.shift();
				}
				return;
			}
			this.#begin();
		}
		this.#utterance.push(block);
		this.#raw.push(raw);
		this.#uttMs += ms;
		this.#quietMs = speech ? 0 : this.#quietMs + ms;
		if (this.#uttMs >= MAX_UTTERANCE_MS || (!this.pushToTalk && this.#quietMs >= END_SILENCE_MS)) {
			this.#end();
		}
	}

	#stop() {
		if (!this.listening) return;
		this.#end();
		this.#teardown();
	}

	#teardown() {
		for (const t of this.#stream?.getTracks() ?? []) t.stop();
		this.#stream = null;
		void this.#ctx?.close();
		this.#ctx = null;
		this.#preroll = [];
		this.#prerollRaw = [];
		this.#utterance = [];
		this.#raw = [];
		this.#denoiseMs = 0;
		this.#deadMs = 0;
		this.#denoiser?.destroy();
		this.#denoiser = null;
		this.#inUtterance = false;
		this.level = 0;
		const events = this.#events;
		this.#events = null;
		if (this.listening) {
			this.listening = false;
			events?.onEnd();
		}
	}

	/** The recogniser factory the Bench's voice input uses. */
	factory(): RecogniserFactory {
		return {
			description: 'offline voice on this device',
			create: async (opts): Promise<Recogniser> => {
				await this.load();
				if (this.state !== 'ready') throw new Error(this.message || 'Offline voice is not ready.');
				return {
					start: () => void this.#listen(opts.events),
					stop: () => this.#stop()
				};
			}
		};
	}
}

/**
 * RNNoise (the same denoise.ts as the Node tests and benchmark), its 112 kB WASM served with the
 * model. Null when it cannot load: voice still works, without suppression, and says so.
 */
async function loadDenoiser(): Promise<(() => BlockDenoiser) | null> {
	try {
		const [{ default: createRNNWasmModule }, { createDenoiser }] = await Promise.all([
			import('@jitsi/rnnoise-wasm/dist/rnnoise.js'),
			import('./denoise')
		]);
		const mod = await createRNNWasmModule({
			locateFile: () => VOICE_BASE + 'rnnoise.wasm'
		});
		await mod.ready;
		return () => createDenoiser(mod);
	} catch (e) {
		console.warn('Noise suppression could not load:', e);
		return null;
	}
}

function joined(blocks: Float32Array[]): Float32Array {
	const out = new Float32Array(blocks.reduce((n, b) => n + b.length, 0));
	let at = 0;
	for (const b of blocks) {
		out.set(b, at);
		at += b.length;
	}
	return out;
}

function rmsOf(block: Float32Array): number {
	let sum = 0;
	for (let i = 0; i < block.length; i++) sum += block[i] * block[i];
	return block.length ? Math.sqrt(sum / block.length) : 0;
}
