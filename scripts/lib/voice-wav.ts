// A spoken test phrase prepared for Chromium's fake microphone (shared by the offline voice
// e2e test and `npm run bench:voice -- --browser`).
import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';

/** The committed spoken test phrases. */
export const voiceFixtures = new URL('../../tests/fixtures/voice/', import.meta.url);

/**
 * The fixture with `seconds` of silence after it, written to a temporary file: Chromium loops
 * the file, and the pause lets the phrase end, the 3 s confirm window run out and the entry be
 * logged before the phrase is heard again. Returns the file's path.
 */
export function paddedWav(file: string, seconds = 7): string {
	const wav = readFileSync(new URL(file, voiceFixtures));
	const dataAt = wav.indexOf('data') + 8;
	const rate = wav.readUInt32LE(24);
	const silence = Buffer.alloc(rate * 2 * seconds);
	const out = Buffer.concat([wav.subarray(0, dataAt), wav.subarray(dataAt), silence]);
	out.writeUInt32LE(out.length - 8, 4);
	out.writeUInt32LE(out.length - dataAt, dataAt - 4);
	return writeTemp(basename(file), out);
}

let written = 0;
const ours = join(tmpdir(), 'benchcall-voice-wav', String(process.pid));
process.once('exit', () => rmSync(ours, { recursive: true, force: true }));

/**
 * A new file each call: Chromium reads its fake microphone's file while it plays, so a file
 * rewritten for a test in another worker would cut the phrase short under it.
 */
function writeTemp(name: string, bytes: Buffer): string {
	const dir = join(ours, String(++written));
	mkdirSync(dir, { recursive: true });
	const path = join(dir, name);
	writeFileSync(path, bytes);
	return path;
}

/** A 16-bit mono PCM WAV of `samples` (−1…1, clamped as a sound card clamps). */
export function wavOf(samples: Float32Array, rate = 16000): Buffer {
	const out = Buffer.alloc(44 + samples.length * 2);
	out.write('RIFF', 0);
	out.writeUInt32LE(out.length - 8, 4);
	out.write('WAVEfmt ', 8);
	out.writeUInt32LE(16, 16);
	out.writeUInt16LE(1, 20); // PCM
	out.writeUInt16LE(1, 22); // mono
	out.writeUInt32LE(rate, 24);
	out.writeUInt32LE(rate * 2, 28);
	out.writeUInt16LE(2, 32);
	out.writeUInt16LE(16, 34);
	out.write('data', 36);
	out.writeUInt32LE(samples.length * 2, 40);
	for (let i = 0; i < samples.length; i++) {
		const x = Math.max(-1, Math.min(1, samples[i]));
		out.writeInt16LE(Math.round(x < 0 ? x * 32768 : x * 32767), 44 + i * 2);
	}
	return out;
}

/** The committed fixture's samples (16-bit mono PCM) and rate. */
function samplesOf(file: string): { rate: number; samples: Float32Array } {
	const wav = readFileSync(new URL(file, voiceFixtures));
	const dataAt = wav.indexOf('data') + 8;
	const n = Math.floor((wav.length - dataAt) / 2);
	const samples = new Float32Array(n);
	for (let i = 0; i < n; i++) samples[i] = wav.readInt16LE(dataAt + i * 2) / 32768;
	return { rate: wav.readUInt32LE(24), samples };
}

/** Bad microphone input for the tests, written to a temporary file: its path. */
export const badWav = {
	/** Digital silence: a muted or dead microphone. */
	silence(seconds = 10): string {
		return writeTemp('silence.wav', wavOf(new Float32Array(16000 * seconds)));
	},
	/** The fixture overdriven `gain` times and clamped at full scale, then a pause. */
	clipped(file: string, gain = 12): string {
		const { rate, samples } = samplesOf(file);
		const out = new Float32Array(samples.length + rate * 6);
		for (let i = 0; i < samples.length; i++) out[i] = samples[i] * gain;
		return writeTemp('clipped-' + basename(file), wavOf(out, rate));
	},
	/** The fixture's speech said again and again without a pause, for `seconds`. */
	long(file: string, seconds = 30): string {
		const { rate, samples } = samplesOf(file);
		// its leading and trailing quiet cut, so the endpointer hears one unbroken phrase
		const loud = (x: number) => Math.abs(x) > 0.01;
		const from = samples.findIndex(loud);
		const to = samples.length - [...samples].reverse().findIndex(loud);
		const speech = samples.subarray(Math.max(0, from), to);
		const out = new Float32Array(rate * seconds);
		for (let i = 0; i < out.length; i++) out[i] = speech[i % speech.length];
		return writeTemp('long-' + basename(file), wavOf(out, rate));
	}
};

/** Chromium flags that make `wavPath` the microphone, allowed without asking. */
export function fakeMicrophoneArgs(wavPath: string): string[] {
	return [
		'--use-fake-device-for-media-stream',
		`--use-file-for-fake-audio-capture=${wavPath}`,
		'--use-fake-ui-for-media-stream',
		'--autoplay-policy=no-user-gesture-required'
	];
}
