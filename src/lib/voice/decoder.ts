/**
 * The soundswallower decoder, the same in Node (tests, benchmark) and in the browser: give it
 * the job's grammar, feed it 16 kHz samples, read the words. Only types are imported here,
 * so this module never pulls the WASM into a bundle by itself.
 */
import type { Decoder, SoundSwallowerModule } from 'soundswallower';
import { buildGrammar, type GrammarInput, type VoiceGrammar } from './grammar';

export type { Decoder, SoundSwallowerModule };

/** The sample rate of the model (and of the test WAVs). */
export const SAMPLE_RATE = 16000;

/** A ready decoder for the bundled US English model. */
export async function createDecoder(ss: SoundSwallowerModule): Promise<Decoder> {
	const decoder = new ss.Decoder({ loglevel: 'FATAL', samprate: SAMPLE_RATE });
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

/** Decodes one whole phrase; '' when nothing in the grammar was heard. */
export function decodePhrase(decoder: Decoder, samples: Float32Array): string {
	decoder.start();
	decoder.process_audio(samples, false, true);
	decoder.stop();
	return decoder.get_text().trim();
}

/**
 * Samples of a PCM WAV file (16-bit integer or 32-bit float, first channel) as floats in
 * −1…1, with its sample rate. Throws on anything else.
 */
export function readWav(bytes: Uint8Array): { sampleRate: number; samples: Float32Array } {
	const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
	const tag = (at: number) => String.fromCharCode(...bytes.subarray(at, at + 4));
	if (bytes.length < 12 || tag(0) !== 'RIFF' || tag(8) !== 'WAVE')
		throw new Error('Not a WAV file.');
	let format = 0;
	let channels = 0;
	let sampleRate = 0;
	let bits = 0;
	for (let at = 12; at + 8 <= bytes.length;) {
		const id = tag(at);
		const size = view.getUint32(at + 4, true);
		const body = at + 8;
		if (id === 'fmt ') {
			format = view.getUint16(body, true);
			channels = view.getUint16(body + 2, true);
			sampleRate = view.getUint32(body + 4, true);
			bits = view.getUint16(body + 14, true);
		} else if (id === 'data') {
			const end = Math.min(body + size, bytes.length);
			const step = (bits / 8) * channels;
			const n = Math.floor((end - body) / step);
			const out = new Float32Array(n);
			for (let i = 0; i < n; i++) {
				const p = body + i * step;
				if (format === 1 && bits === 16) out[i] = view.getInt16(p, true) / 32768;
				else if (format === 3 && bits === 32) out[i] = view.getFloat32(p, true);
				else throw new Error(`Unsupported WAV sample format ${format}/${bits} bits.`);
			}
			return { sampleRate, samples: out };
		}
		at = body + size + (size % 2);
	}
	throw new Error('The WAV file has no data.');
}
