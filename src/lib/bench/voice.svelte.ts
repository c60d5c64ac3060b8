/**
 * The Bench's microphone: starts and stops the recogniser chosen in the voice settings, passes
 * every phrase heard through the gate (a refused one is never logged) and hands the rest to the
 * call bar, which logs it after the confirm window. The recognisers, the gate and hands-free live
 * in `$lib/voice`; this only wires them to the call bar.
 */
import { untrack } from 'svelte';
import { isCancel } from '$lib/phrase';
import { BenchHearing } from '$lib/voice/bench-hearing.svelte';
import { gatePhrase } from '$lib/voice/gate';
import { confidenceFor, type Heard } from '$lib/voice/heard';
import { readBack, stepPhrases, type Recogniser } from '$lib/voice/recogniser';
import { pickRecogniser, voiceAvailable } from '$lib/voice/settings.svelte';
import type { CallBar } from './call-bar.svelte';
import type { BenchJobState } from './job-state.svelte';

export class BenchVoice {
	#bar: CallBar;
	#job: BenchJobState;
	#settings: () => { tolerancePct: number; timeZone: string };
	#recogniser: Recogniser | null = null;
	#pushToTalk = false;
	/** null until the page has asked the browser. */
	ready = $state<boolean | null>(null);
	listening = $state(false);
	/** Listening was asked for, but the microphone's sound has not reached the recogniser yet. */
	starting = $state(false);
	interim = $state('');
	error = $state('');
	readonly hearing: BenchHearing;

	constructor(
		bar: CallBar,
		job: BenchJobState,
		settings: () => { tolerancePct: number; timeZone: string }
	) {
		this.#bar = bar;
		this.#job = job;
		this.#settings = settings;
		this.hearing = new BenchHearing({
			start: () => void this.start(),
			stop: () => this.stop(),
			speak: (t) => readBack(t)
		});
	}

	/** Asks the browser once mounted: the server cannot know. */
	detect() {
		this.ready = voiceAvailable();
	}

	/** Follows the hands-free switch of the voice settings. */
	handsFree(on: boolean) {
		untrack(() => this.hearing.dispatch({ type: on ? 'turn_on' : 'turn_off' }));
	}

	#onFinal(alternatives: Heard[]) {
		this.interim = '';
		const out = this.hearing.hear(
			alternatives,
			(h) => {
				const parsed = this.#job.parser.parse(h.text, this.#settings());
				const step = this.#job.specs.find((st) => st.id === parsed.stepId) ?? null;
				const answer = gatePhrase({ heard: h.text, parsed, step, ...confidenceFor(h) });
				return { ...answer, intent: parsed.intent };
			},
			isCancel
		);
		if (out?.kind === 'check') {
			// the technician reads it and sends it by hand
			this.#bar.check(
				out.text,
				out.why === 'note'
					? 'Heard a note: check its words, then press Enter.'
					: 'Heard a value out of spec, not for sure: check it, then press Enter.'
			);
			return;
		}
		if (out?.kind !== 'confirm' && out?.kind !== 'cancel') return;
		const words = out.kind === 'confirm' ? out.text : 'cancel';
		if (isCancel(words)) this.#bar.cancelled();
		else this.#bar.confirm(words);
	}

	async start() {
		if (this.listening) return;
		// the recogniser chosen in the voice settings (browser, on-device or offline)
		const factory = await pickRecogniser();
		if (!factory) {
			this.error = 'No speech recognition can run in this browser.';
			return;
		}
		this.error = '';
		try {
			this.#recogniser = await factory.create({
				lang: 'en-US',
				phrases: stepPhrases(this.#job.steps),
				events: {
					onReady: () => {
						this.starting = false;
					},
					onInterim: (w) => {
						this.interim = w;
						this.#bar.text = w;
						this.#bar.source = 'voice';
					},
					onFinal: (alternatives) => this.#onFinal(alternatives),
					onUnread: (m, why) => this.hearing.notRead(m, why),
					onError: (m, code) => {
						// in hands-free, a quiet spell is normal, not a fault
						if (code === 'no-speech' && this.hearing.handsFree.on) return;
						this.error = m;
						this.hearing.dispatch({ type: 'error', message: m });
					},
					onEnd: () => {
						this.listening = false;
						this.starting = false;
						this.interim = '';
						this.hearing.dispatch({ type: 'ended' });
					}
				}
			});
			this.starting = true;
			this.listening = true;
			this.#recogniser.start();
			this.hearing.dispatch({ type: 'started' });
		} catch (e) {
			this.error = e instanceof Error ? e.message : 'The microphone could not start.';
			this.hearing.dispatch({ type: 'error', message: this.error });
		}
	}

	stop() {
		this.#recogniser?.stop();
		this.listening = false;
		this.starting = false;
	}

	/** The mic button: in hands-free it pauses and resumes listening. */
	toggle() {
		if (this.hearing.handsFree.on)
			this.hearing.dispatch({ type: this.listening ? 'pause' : 'resume' });
		else if (this.listening) this.stop();
		else void this.start();
		this.#bar.focus();
	}

	/** F2 held down: listens until it is let go. */
	pushDown() {
		this.#pushToTalk = true;
		void this.start();
	}

	pushUp() {
		if (!this.#pushToTalk) return;
		this.#pushToTalk = false;
		this.stop();
	}

	destroy() {
		this.hearing.destroy();
		this.#recogniser?.stop();
	}
}
