/** Writes mono float samples (−1…1) as a 16-bit PCM WAV file. */
import { writeFileSync } from 'node:fs';

export function encodeWav16(samples: Float32Array, sampleRate: number): Uint8Array {
	const bytes = new Uint8Array(44 + samples.length * 2);
	const view = new DataView(bytes.buffer);
	const text = (at: number, s: string) => {
		for (let i = 0; i < s.length; i++) bytes[at + i] = s.charCodeAt(i);
	};
	text(0, 'RIFF');
	view.setUint32(4, 36 + samples.length * 2, true);
	text(8, 'WAVE');
	text(12, 'fmt ');
	view.setUint32(16, 16, true);
	view.setUint16(20, 1, true); // PCM
	view.setUint16(22, 1, true); // mono
	view.setUint32(24, sampleRate, true);
	view.setUint32(28, sampleRate * 2, true);
	view.setUint16(32, 2, true);
	view.setUint16(34, 16, true);
	text(36, 'data');
	view.setUint32(40, samples.length * 2, true);
	for (let i = 0; i < samples.length; i++) {
		const v = Math.max(-1, Math.min(1, samples[i]));
		view.setInt16(44 + i * 2, Math.round(v < 0 ? v * 32768 : v * 32767), true);
	}
	return bytes;
}

export function writeWav16(file: string, samples: Float32Array, sampleRate: number): void {
	writeFileSync(file, encodeWav16(samples, sampleRate));
}
