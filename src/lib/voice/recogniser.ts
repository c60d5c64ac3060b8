/**
 * Speech recognition behind a small interface, so the Bench does not care which recogniser
 * listens: the browser's Web Speech API today, an offline one (a grammar decoder in WASM) later.
 */
import { speechConfidence, type Heard } from './heard';
import type { AudioProblem } from './audio';

export interface RecogniserEvents {
	/**
	 * The microphone is open and its sound reaches the recogniser: from now on every word is
	 * heard. Until then the Bench says it is starting, not listening.
	 */
	onReady?(): void;
	/** Words heard so far of the phrase being spoken. */
	onInterim(text: string): void;
	/** A finished phrase: the recogniser's alternatives, best first (one for offline voice). */
	onFinal(alternatives: Heard[]): void;
	/** Audio that was not read (silence, clipping, too long, nothing of the grammar), and why. */
	onUnread?(message: string, reason: AudioProblem | 'nothing'): void;
	/** `code`: the Web Speech error code where there is one ('no-speech', 'network', …). */
	onError(message: string, code?: string): void;
	/** Listening stopped (by stop(), silence or an error). */
	onEnd(): void;
}

export interface Recogniser {
	start(): void;
	stop(): void;
}

export interface RecogniserOptions {
	lang: string;
	/** Words of the job's steps, to bias recognition where the engine supports it. */
	phrases: string[];
	events: RecogniserEvents;
}

export interface RecogniserFactory {
	/** Short words for the screen: where the words are recognised. */
	readonly description: string;
	create(opts: RecogniserOptions): Promise<Recogniser>;
}

// The parts of the Web Speech API used here, feature-detected one by one.
interface SpeechResultLike extends ArrayLike<{ transcript: string; confidence?: number }> {
	isFinal: boolean;
}
interface SpeechEventLike {
	resultIndex: number;
	results: ArrayLike<SpeechResultLike>;
}
interface SpeechRecognitionLike {
	lang: string;
	continuous: boolean;
	interimResults: boolean;
	maxAlternatives: number;
	processLocally?: boolean;
	phrases?: unknown;
	onresult: ((e: SpeechEventLike) => void) | null;
	onerror: ((e: { error?: string; message?: string }) => void) | null;
	onend: (() => void) | null;
	onaudiostart?: (() => void) | null;
	start(): void;
	stop(): void;
}
interface SpeechRecognitionCtor {
	new (): SpeechRecognitionLike;
	available?: (o: { langs: string[]; processLocally: boolean }) => Promise<string>;
}

const ERRORS: Record<string, string> = {
	'not-allowed': 'The microphone is blocked for this site: allow it in the browser’s settings.',
	'service-not-allowed': 'Speech recognition is not allowed here.',
	'audio-capture': 'No microphone was found.',
	network: 'Speech recognition needs a network connection in this browser.',
	'no-speech': 'Nothing was heard.',
	'language-not-supported': 'This language is not supported by the recogniser.'
};

/** The Web Speech recogniser of this browser, or null when it has none. */
export function webSpeech(
	win: Record<string, unknown> = globalThis as never
): RecogniserFactory | null {
	const Ctor = (win.SpeechRecognition ?? win.webkitSpeechRecognition) as
		SpeechRecognitionCtor | undefined;
	if (typeof Ctor !== 'function') return null;
	const Phrase = win.SpeechRecognitionPhrase as
		(new (phrase: string, boost: number) => unknown) | undefined;
	return {
		description: 'the browser’s speech recognition',
		async create({ lang, phrases, events }) {
			const rec = new Ctor();
			rec.lang = lang;
			rec.continuous = true;
			rec.interimResults = true;
			// more than one reading, so the gate can take a later one it trusts (heard.ts)
			rec.maxAlternatives = 3;
			// On-device recognition where the browser says it is installed for this language.
			if (typeof Ctor.available === 'function' && 'processLocally' in rec) {
				try {
					const state = await Ctor.available({ langs: [lang], processLocally: true });
					if (state === 'available') rec.processLocally = true;
				} catch {
					// stays with the default engine
				}
			}
			if (typeof Phrase === 'function' && 'phrases' in rec && phrases.length) {
				try {
					rec.phrases = phrases.slice(0, 200).map((p) => new Phrase(p, 3));
				} catch {
					// biasing is a nicety
				}
			}
			rec.onresult = (e) => {
				let interim = '';
				for (let i = e.resultIndex; i < e.results.length; i++) {
					const r = e.results[i];
					if (r.isFinal) events.onFinal(alternativesOf(r));
					else interim += r[0]?.transcript ?? '';
				}
				if (interim) events.onInterim(interim.trim());
			};
			rec.onerror = (e) =>
				events.onError(
					ERRORS[e.error ?? ''] ?? e.message ?? 'Speech recognition stopped.',
					e.error
				);
			rec.onend = () => events.onEnd();
			// an engine without the event is taken as ready once started
			const hasAudioStart = 'onaudiostart' in rec;
			if (hasAudioStart) rec.onaudiostart = () => events.onReady?.();
			return {
				start: () => {
					rec.start();
					if (!hasAudioStart) events.onReady?.();
				},
				stop: () => rec.stop()
			};
		}
	};
}

/** A final Web Speech result's alternatives with their confidence (0 from the engine: unknown). */
export function alternativesOf(r: SpeechResultLike): Heard[] {
	const out: Heard[] = [];
	for (let j = 0; j < r.length; j++) {
		const text = (r[j]?.transcript ?? '').trim();
		if (text) out.push({ text, confidence: speechConfidence(r[j].confidence) });
	}
	return out;
}

/** Distinct words of the job's step names and aliases, for biasing. */
export function stepPhrases(steps: { label: string; aliases?: string[] }[]): string[] {
	const out = new Set<string>();
	for (const s of steps) {
		out.add(s.label.toLowerCase());
		for (const a of s.aliases ?? []) out.add(a.toLowerCase());
	}
	return [...out];
}

/** Reads a sentence aloud with a voice that runs on the device; false when there is none. */
export function readBack(
	text: string,
	win: Record<string, unknown> = globalThis as never
): boolean {
	const synth = win.speechSynthesis as SpeechSynthesis | undefined;
	const Utterance = win.SpeechSynthesisUtterance as typeof SpeechSynthesisUtterance | undefined;
	if (!synth || typeof Utterance !== 'function') return false;
	const voice = synth.getVoices().find((v) => v.localService && v.lang.startsWith('en'));
	if (!voice) return false;
	const u = new Utterance(text);
	u.voice = voice;
	synth.cancel();
	synth.speak(u);
	return true;
}
