import { describe, expect, it } from 'vitest';
import { addBlock, newStats, utteranceProblem } from './utterance';

const RATE = 16000;

/** A 440 Hz tone of `seconds` at `amplitude`, clipped at ±1 like an overdriven input. */
function tone(seconds: number, amplitude: number): Float32Array {
	const out = new Float32Array(Math.round(seconds * RATE));
	for (let i = 0; i < out.length; i++) {
		out[i] = Math.max(-1, Math.min(1, amplitude * Math.sin((2 * Math.PI * 440 * i) / RATE)));
	}
	return out;
}

function statsOf(...blocks: Float32Array[]) {
	const s = newStats();
	for (const b of blocks) addBlock(s, b);
	return s;
}

describe('utteranceProblem', () => {
	it('passes an ordinary phrase (2.5 s at about −12 dBFS)', () => {
		expect(utteranceProblem(statsOf(tone(1.5, 0.35), tone(1, 0.2)), RATE)).toBeNull();
	});

	it('calls digital silence and a near-silent hiss silence', () => {
		expect(utteranceProblem(statsOf(new Float32Array(RATE * 2)), RATE)?.reason).toBe('silence');
		expect(utteranceProblem(newStats(), RATE)?.reason).toBe('silence');
		// −60 dBFS peak: under the −50 dBFS floor
		expect(utteranceProblem(statsOf(tone(2, 0.001)), RATE)?.reason).toBe('silence');
	});

	it('calls an overdriven phrase clipped, but not one loud peak', () => {
		// amplitude 3: about 80 % of the samples sit at full scale
		expect(utteranceProblem(statsOf(tone(2, 3)), RATE)?.reason).toBe('clipped');
		const oneClick = tone(2, 0.3);
		oneClick[100] = 1;
		expect(utteranceProblem(statsOf(oneClick), RATE)).toBeNull();
	});

	it('calls a phrase of 10 s or more too long, in blocks as the microphone sends them', () => {
		const blocks = Array.from({ length: 100 }, () => tone(0.1, 0.3));
		expect(utteranceProblem(statsOf(...blocks), RATE)?.reason).toBe('too_long');
		expect(utteranceProblem(statsOf(...blocks.slice(0, 99)), RATE)).toBeNull();
		expect(utteranceProblem(statsOf(tone(5, 0.3)), RATE, 4)?.message).toMatch(/over 4 seconds/);
	});
});
