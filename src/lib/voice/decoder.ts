/**
 * The soundswallower decoder, the same in Node (tests, benchmark) and in the browser: give it
 * the job's grammar, feed it 16 kHz samples, read the words. Only types are imported here,
 * so this module never pulls the WASM into a bundle by itself.
 */
import type { Decoder, SoundSwallowerModule } from 'soundswallower';
import { SAMPLE_RATE } from './audio';
import { buildGrammar, GARBAGE_PREFIX, type GrammarInput, type VoiceGrammar } from './grammar';

export type { Decoder, SoundSwallowerModule };
export { SAMPLE_RATE, readWav, readWavForModel, resample, checkPhraseAudio } from './audio';

/**
 * Decoder settings Benchcall changes from soundswallower's defaults, measured on the voice
 * corpus's tuning split (README, Voice). Keys are soundswallower's own.
 */
export const DECODER_SETTINGS: Record<string, string | number | boolean> = {};

/** A ready decoder for the bundled US English model. */
export async function createDecoder(
	ss: SoundSwallowerModule,
	settings: Record<string, string | number | boolean> = DECODER_SETTINGS
): Promise<Decoder> {
	const decoder = new ss.Decoder({ loglevel: 'FATAL', samprate: SAMPLE_RATE, ...settings });
	await decoder.initialize();
	return decoder;
}

/**
 * Builds the job's grammar against the decoder's dictionary, adds the words it made
 * pronunciations for (only those the dictionary does not know: adding a known word throws)
 * and switches the decoder to it.
 */
export function useGrammar(decoder: Decoder, input: GrammarInput): VoiceGrammar {
	const grammar = buildGrammar(input, (w) => decoder.lookup_word(w));
	const fresh = grammar.added.filter(([w]) => decoder.lookup_word(w) === null);
	if (fresh.length) decoder.add_words(...fresh);
	decoder.set_grammar(grammar.jsgf);
	return grammar;
}

export interface HeardWord {
	word: string;
	/** Seconds from the start of the phrase. */
	start: number;
	end: number;
	/** The word's posterior probability from the decoder's lattice (0…1). */
	score: number;
}

export interface DecodedPhrase {
	/** The words heard, '' when nothing in the grammar was heard. */
	text: string;
	/** How sure the decoder is of the whole phrase, 0…1 (see `phraseConfidence`). */
	confidence: number;
	words: HeardWord[];
}

/** Fillers and silences in the alignment: not words the technician said. */
const FILLER = /^(<.*>|\(NULL\)|\[.*\])$/;

/**
 * Decodes one whole phrase (16 kHz, −1…1). A fresh utterance each time: the cepstral mean is
 * taken over the whole phrase (`full_utt`), so one phrase's loudness does not carry into the next.
 */
export function decodePhrase(decoder: Decoder, samples: Float32Array): DecodedPhrase {
	decoder.start();
	decoder.process_audio(samples, false, true);
	decoder.stop();
	const raw = decoder.get_text().trim();
	if (!raw) return { text: '', confidence: 0, words: [] };
	const words: HeardWord[] = [];
	let garbage = false;
	for (const seg of decoder.get_alignment().w ?? []) {
		if (FILLER.test(seg.t)) continue;
		const word = seg.t.replace(/\(\d+\)$/, '');
		const end = seg.b + seg.d;
		if (word.startsWith(GARBAGE_PREFIX)) {
			// speech no call fits: shown as "…", and the phrase is not trusted
			garbage = true;
			const last = words.at(-1);
			if (last?.word === '…') last.end = end;
			else words.push({ word: '…', start: seg.b, end, score: 0 });
			continue;
		}
		words.push({ word, start: seg.b, end, score: seg.p });
	}
	const text = words.map((w) => w.word).join(' ');
	return { text, confidence: garbage ? 0 : phraseConfidence(words), words };
}

/**
 * The phrase's confidence from its words' posterior probabilities (the decoder's lattice,
 * `get_alignment()`): the weakest word counts most, because one misheard word (a unit, a digit)
 * is enough to log a wrong value. Confidence = min(p)^0.5 · mean(p)^0.5, 0 when no word.
 */
export function phraseConfidence(words: Pick<HeardWord, 'score'>[]): number {
	if (!words.length) return 0;
	let min = 1;
	let sum = 0;
	for (const w of words) {
		const p = Number.isFinite(w.score) ? Math.max(0, Math.min(1, w.score)) : 0;
		min = Math.min(min, p);
		sum += p;
	}
	return Math.sqrt(min * (sum / words.length));
}
