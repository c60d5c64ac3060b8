// A spoken test phrase prepared for Chromium's fake microphone (shared by the offline voice
// e2e test and `npm run bench:voice -- --browser`).
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

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
	const dir = join(tmpdir(), 'benchcall-voice-wav');
	mkdirSync(dir, { recursive: true });
	const path = join(dir, file);
	writeFileSync(path, out);
	return path;
}

/** Chromium flags that make `wavPath` the microphone, allowed without asking. */
export function fakeMicrophoneArgs(wavPath: string): string[] {
	return [
		'--use-fake-device-for-media-stream',
		`--use-file-for-fake-audio-capture=${wavPath}`,
		'--use-fake-ui-for-media-stream',
		'--autoplay-policy=no-user-gesture-required'
	];
}
