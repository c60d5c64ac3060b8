/**
 * Audio in, before the recogniser: WAV files read into samples (any common PCM or float
 * format, any rate, mono or stereo), resampled to the model's 16 kHz, and a phrase checked
 * for what makes decoding pointless (silence, clipping, a recording far longer than a call).
 * Never throws on bad audio without a clear message; pure, runs in Node and the browser.
 */

/** The sample rate of the model. */
export const SAMPLE_RATE = 16000;
/** Longest recording decoded as one call; a call is a few seconds. */
export const MAX_PHRASE_SECONDS = 12;
/** Shortest: a bare "next" takes about 0.3 s. */
export const MIN_PHRASE_SECONDS = 0.2;

export class AudioInputError extends Error {
	constructor(message: string) {
		super(message);
		this.name = 'AudioInputError';
	}
}

/**
 * Samples of a WAV file as floats in −1…1 (channels averaged to mono) with its sample rate.
 * Reads 8-bit unsigned, 16/24/32-bit integer and 32/64-bit float PCM, plain or
 * WAVE_FORMAT_EXTENSIBLE. Anything else throws an `AudioInputError` saying what it found.
 */
export function readWav(bytes: Uint8Array): { sampleRate: number; samples: Float32Array } {
	const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
	const tag = (at: number) => String.fromCharCode(...bytes.subarray(at, at + 4));
	if (bytes.length < 12 || tag(0) !== 'RIFF' || tag(8) !== 'WAVE')
		throw new AudioInputError('Not a WAV file.');
	let format = 0;
	let channels = 0;
	let sampleRate = 0;
	let bits = 0;
	for (let at = 12; at + 8 <= bytes.length;) {
		const id = tag(at);
		const size = view.getUint32(at + 4, true);
		const body = at + 8;
		if (id === 'fmt ') {
			if (size < 16 || body + 16 > bytes.length)
				throw new AudioInputError('The WAV file’s format block is cut short.');
			format = view.getUint16(body, true);
			channels = view.getUint16(body + 2, true);
			sampleRate = view.getUint32(body + 4, true);
			bits = view.getUint16(body + 14, true);
			// WAVE_FORMAT_EXTENSIBLE: the real format is the first two bytes of the sub-format GUID
			if (format === 0xfffe && size >= 40 && body + 26 <= bytes.length)
				format = view.getUint16(body + 24, true);
		} else if (id === 'data') {
			if (!format) throw new AudioInputError('The WAV file has no format block before its data.');
			return { sampleRate, samples: decodeSamples(view, body, size, format, channels, bits) };
		}
		at = body + size + (size % 2);
	}
	throw new AudioInputError('The WAV file has no data.');
}

function decodeSamples(
	view: DataView,
	body: number,
	size: number,
	format: number,
	channels: number,
	bits: number
): Float32Array {
	const read = sampleReader(view, format, bits);
	if (!read)
		throw new AudioInputError(
			`Unsupported WAV sample format (${format === 1 ? 'integer' : format === 3 ? 'float' : `code ${format}`}, ${bits} bits): use 16-bit PCM.`
		);
	if (channels < 1 || channels > 8)
		throw new AudioInputError(`Unsupported WAV channel count ${channels}.`);
	const width = bits / 8;
	const step = width * channels;
	const end = Math.min(body + size, view.byteLength);
	const n = Math.max(0, Math.floor((end - body) / step));
	const out = new Float32Array(n);
	for (let i = 0; i < n; i++) {
		let sum = 0;
		for (let c = 0; c < channels; c++) sum += read(body + i * step + c * width);
		const v = sum / channels;
		out[i] = Number.isFinite(v) ? v : 0;
	}
	return out;
}

function sampleReader(view: DataView, format: number, bits: number) {
	if (format === 1 && bits === 8) return (p: number) => (view.getUint8(p) - 128) / 128;
	if (format === 1 && bits === 16) return (p: number) => view.getInt16(p, true) / 32768;
	if (format === 1 && bits === 24)
		return (p: number) =>
			((view.getInt8(p + 2) << 16) | (view.getUint8(p + 1) << 8) | view.getUint8(p)) / 8388608;
	if (format === 1 && bits === 32) return (p: number) => view.getInt32(p, true) / 2147483648;
	if (format === 3 && bits === 32) return (p: number) => view.getFloat32(p, true);
	if (format === 3 && bits === 64) return (p: number) => view.getFloat64(p, true);
	return null;
}

/**
 * Resamples to `to` Hz with a windowed-sinc (Blackman) interpolator whose cut-off follows the
 * lower of the two rates, so 44.1 or 48 kHz audio comes down without aliasing and 8 kHz audio
 * comes up without images (it stays telephone-band: nothing above 4 kHz is made up).
 */
export function resample(samples: Float32Array, from: number, to: number): Float32Array {
	if (!(from > 0) || !(to > 0)) throw new AudioInputError(`Bad sample rate ${from} Hz.`);
	if (from === to) return samples;
	const ratio = to / from;
	const n = Math.floor(samples.length * ratio);
	const out = new Float32Array(n);
	const cutoff = Math.min(1, ratio) * 0.95; // of the input's Nyquist frequency
	const half = Math.ceil(8 / Math.min(1, ratio)); // taps each side, in input samples
	for (let i = 0; i < n; i++) {
		const x = i / ratio;
		const centre = Math.floor(x);
		let acc = 0;
		let norm = 0;
		for (let k = centre - half + 1; k <= centre + half; k++) {
			if (k < 0 || k >= samples.length) continue;
			const t = x - k;
			const s = t === 0 ? 1 : Math.sin(Math.PI * cutoff * t) / (Math.PI * cutoff * t);
			const w =
				0.42 + 0.5 * Math.cos((Math.PI * t) / half) + 0.08 * Math.cos((2 * Math.PI * t) / half);
			const h = s * w;
			acc += h * samples[k];
			norm += h;
		}
		out[i] = norm ? acc / norm : 0;
	}
	return out;
}

/** A WAV file's samples at the model's rate, mono. */
export function readWavForModel(bytes: Uint8Array): Float32Array {
	const { sampleRate, samples } = readWav(bytes);
	if (sampleRate < 8000 || sampleRate > 192000)
		throw new AudioInputError(
			`Unsupported sample rate ${sampleRate} Hz: record at 16 kHz or more.`
		);
	return resample(samples, sampleRate, SAMPLE_RATE);
}

export type AudioProblem = 'too_short' | 'too_long' | 'silent' | 'clipped';

/**
 * What makes a recorded phrase (16 kHz) not worth decoding, with a message for the
 * technician; null when it is fine. Silence: loudest 30 ms below −50 dBFS. Clipping: more
 * than 0.5 % of samples at full scale (the decoder then hears distortion, not words).
 */
export function checkPhraseAudio(
	samples: Float32Array
): { problem: AudioProblem; message: string } | null {
	const seconds = samples.length / SAMPLE_RATE;
	if (seconds < MIN_PHRASE_SECONDS)
		return {
			problem: 'too_short',
			message: 'Too short to hear a call: hold the key while you speak.'
		};
	if (seconds > MAX_PHRASE_SECONDS)
		return {
			problem: 'too_long',
			message: `That recording is ${Math.round(seconds)} s long: say one call at a time (up to ${MAX_PHRASE_SECONDS} s).`
		};
	const win = 480;
	let loudest = 0;
	let clipped = 0;
	for (let at = 0; at < samples.length; at += win) {
		let sum = 0;
		const end = Math.min(samples.length, at + win);
		for (let i = at; i < end; i++) {
			const v = samples[i];
			sum += v * v;
			if (Math.abs(v) >= 0.999) clipped++;
		}
		loudest = Math.max(loudest, Math.sqrt(sum / (end - at)));
	}
	if (loudest < 10 ** (-50 / 20))
		return {
			problem: 'silent',
			message: 'Nothing heard: check the microphone and speak closer to it.'
		};
	if (clipped > samples.length * 0.005)
		return {
			problem: 'clipped',
			message:
				'Too loud to hear clearly (the sound is clipped): hold the microphone a little further away or turn its gain down.'
		};
	return null;
}
