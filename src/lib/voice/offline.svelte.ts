/**
 * The offline recogniser in the browser: soundswallower (PocketSphinx in WASM) with a grammar
 * built from the current job, fed from the microphone through an AudioWorklet. Nothing leaves
 * the device. The package is imported only when offline voice is switched on, so neither SSR
 * nor a Bench without it ever loads the WASM or the 10 MB model.
 */
import type { Recogniser, RecogniserEvents, RecogniserFactory } from './recogniser';
import type { Decoder } from './decoder';
import type { GrammarInput } from './grammar';
import { checkPhraseAudio } from './audio';
import { HeldEndpoint, LevelEndpoint, rmsOf, type Endpoint, type Utterance } from './endpoint';
import type { CaptureCommand, CaptureMessage } from './capture-worklet';
// the capture worklet bundled with RNNoise and its imports, under a per-deploy file name
import captureWorkletUrl from './capture-worklet.ts?worker&url';

/** Where scripts/lib/voice-model-plugin.js serves the model and the WASM files. */
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
/** A microphone that sends only zeros this long is called out once (muted or unplugged). */
const DEAD_MIC_MS = 3000;
/** How long the microphone waits for RNNoise to start in the capture worklet. */
const DENOISER_WAIT_MS = 5000;

interface SoundPath {
	ctx: AudioContext;
	node: AudioWorkletNode;
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
	 * How long the last phrase took to read after it ended (ms): its decoding. Noise suppression
	 * runs in the capture worklet while the phrase is spoken, so it adds nothing here. Shown so a
	 * slow device is noticed.
	 */
	decodeMs = $state<number | null>(null);
	/** True when noise suppression runs before the decoder (the worklet says so once it starts). */
	denoising = $state(false);
	/** True once the capture worklet has started RNNoise on the audio thread. */
	denoiseRunning = $state(false);
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
		if (!this.#speaking) this.#applyGrammar();
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
		const [{ default: createModule }, tools] = await Promise.all([
			import('soundswallower'),
			import('./decoder')
		]);
		// RNNoise comes with the capture worklet; the worklet says if it cannot start
		this.denoising = true;
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
		this.#warmOnFirstTouch();
	}

	/**
	 * Builds the sound path at the first touch or key on the page after loading, so the first
	 * call waits only for the microphone (measured p95 to "Listening": 0.28 s, against 0.71 s
	 * when the press itself is that touch). A page may run audio only after such a gesture; the
	 * path is suspended again at once.
	 */
	#warmOnFirstTouch() {
		if (typeof addEventListener !== 'function') return;
		const warm = () => {
			removeEventListener('pointerdown', warm, true);
			removeEventListener('keydown', warm, true);
			this.#soundPath()
				.then(({ ctx }) => {
					if (!this.listening) void ctx.suspend();
				})
				.catch(() => {}); // the first call tries again and says what failed
		};
		addEventListener('pointerdown', warm, true);
		addEventListener('keydown', warm, true);
	}

	// --- listening ------------------------------------------------------------------------------

	#stream: MediaStream | null = null;
	/** The sound path, built on the first call and kept, suspended, between calls. */
	#path: Promise<SoundPath> | null = null;
	#source: MediaStreamAudioSourceNode | null = null;
	#events: RecogniserEvents | null = null;
	/** Cuts the microphone's blocks into calls: at pauses, or at the key (push-to-talk). */
	#endpoint: Endpoint | null = null;
	#deadMs = 0;
	/** Counts listening sessions: a stop while the microphone is still opening ends that one. */
	#session = 0;
	/** True from connecting the microphone until its first sound reaches the page. */
	#awaitingSound = false;

	/** True while a call is being heard: the grammar is not switched under it. */
	get #speaking(): boolean {
		return this.#endpoint?.inSpeech ?? false;
	}

	/**
	 * The audio context and the capture worklet with RNNoise started in it. Built once a page
	 * (about half a second: the worklet carries RNNoise) and kept, so a push-to-talk press after
	 * the first waits only for the microphone.
	 */
	#soundPath(): Promise<SoundPath> {
		this.#path ??= this.#buildSoundPath().catch((e: unknown) => {
			this.#path = null;
			throw e;
		});
		return this.#path;
	}

	async #buildSoundPath(): Promise<SoundPath> {
		const ctx = new AudioContext({ sampleRate: SAMPLE_RATE });
		try {
			await ctx.audioWorklet.addModule(captureWorkletUrl);
			const node = new AudioWorkletNode(ctx, 'benchcall-capture');
			const denoiser = new Promise<void>((resolve) => {
				node.port.onmessage = (e: MessageEvent<CaptureMessage>) => {
					this.#onMessage(e.data);
					if (e.data.kind === 'denoise') resolve();
				};
				// a worklet that never answers does not keep the microphone shut (capture.ts then
				// holds the sound back a while longer)
				setTimeout(resolve, DENOISER_WAIT_MS);
			});
			const mute = ctx.createGain();
			mute.gain.value = 0;
			node.connect(mute).connect(ctx.destination);
			await denoiser;
			return { ctx, node };
		} catch (e) {
			void ctx.close();
			throw e;
		}
	}

	/**
	 * The sound path is made ready first, and only then is the microphone opened and connected
	 * to it: what is said once the Bench shows "listening" reaches the decoder whole. Opened
	 * first, the microphone's sound was lost while the worklet loaded, and on a busy device that
	 * was the first words of the call.
	 */
	async #listen(events: RecogniserEvents) {
		if (this.listening) return;
		const session = ++this.#session;
		const ended = () => session !== this.#session;
		this.#events = events;
		this.listening = true;
		try {
			const { ctx, node } = await this.#soundPath();
			if (ended()) return;
			// always: the last call's suspend may still be under way, and resume() comes after it
			void ctx.resume();
			if (ctx.state !== 'running') {
				// hands-free restored on a fresh page: the browser lets sound run after a first touch
				const wake = () => void ctx.resume();
				addEventListener('pointerdown', wake, { once: true });
				addEventListener('keydown', wake, { once: true });
			}
			const stream = await navigator.mediaDevices.getUserMedia({
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
			if (ended()) {
				for (const t of stream.getTracks()) t.stop();
				return;
			}
			this.#stream = stream;
			this.#applyGrammar();
			this.#endpoint = this.pushToTalk ? new HeldEndpoint() : new LevelEndpoint();
			this.#awaitingSound = true;
			// the last call's unfinished block is dropped, so this one starts with its own sound
			node.port.postMessage({ kind: 'reset' } satisfies CaptureCommand);
			this.#source = ctx.createMediaStreamSource(stream);
			this.#source.connect(node);
		} catch (e) {
			if (ended()) return;
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

	/** One call cut from the stream: judged on its raw sound, decoded from the cleaned. */
	#hear(u: Utterance) {
		if (!this.#decoder) return;
		const problem = checkPhraseAudio(u.raw);
		if (problem) {
			// never decoded, so never logged: the Bench shows why
			this.#events?.onInterim('');
			this.#events?.onUnread?.(problem.message, problem.problem);
			this.#applyGrammar();
			return;
		}
		// whole-phrase decoding, as in the Node test and benchmark (about 0.1–0.25 s a phrase)
		const t0 = performance.now();
		const heard = this.#grammarTools!.decodePhrase(this.#decoder, u.clean);
		this.decodeMs = Math.round(performance.now() - t0);
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

	#onMessage(m: CaptureMessage) {
		if (m.kind === 'block') {
			// a block still on its way when listening stopped
			if (!this.#stream) return;
			if (this.#awaitingSound) {
				this.#awaitingSound = false;
				this.#events?.onReady?.();
			}
			this.#onBlock(m.raw, m.clean ?? m.raw);
		} else if (!m.ok) {
			// voice still works, without suppression, and the settings stop saying it is on
			this.denoising = false;
			this.denoiseRunning = false;
			console.warn('Noise suppression could not start:', m.message);
		} else this.denoiseRunning = true;
	}

	/** One block of about 100 ms: what the microphone sent, and the same after suppression. */
	#onBlock(raw: Float32Array, block: Float32Array) {
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
		const call = this.#endpoint?.push(raw, block);
		if (call) this.#hear(call);
	}

	#stop() {
		if (!this.listening) return;
		const call = this.#endpoint?.flush();
		if (call) this.#hear(call);
		this.#teardown();
	}

	#teardown() {
		this.#session++;
		this.#awaitingSound = false;
		this.#source?.disconnect();
		this.#source = null;
		for (const t of this.#stream?.getTracks() ?? []) t.stop();
		this.#stream = null;
		// the sound path is kept for the next call, silent
		void this.#path?.then(({ ctx }) => ctx.suspend()).catch(() => {});
		this.#endpoint = null;
		this.#deadMs = 0;
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
