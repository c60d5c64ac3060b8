/**
 * Checks on a phrase's raw microphone audio before it is decoded: nothing heard, a clipped
 * (overdriven) signal, or a phrase too long to be one call-out. Each gets a clear message and
 * is never decoded, so it can never be logged. Pure.
 */

/** Running figures of one phrase's raw samples (−1…1), kept block by block. */
export interface UtteranceStats {
	samples: number;
	sumSquares: number;
	/** Samples at or beyond ±CLIP_LEVEL. */
	clipped: number;
}

export type UtteranceProblem = {
	reason: 'silence' | 'clipped' | 'too_long';
	message: string;
};

/** Full scale less about 0.1 dB: where an overdriven input flattens. */
export const CLIP_LEVEL = 0.99;
/** RMS below this (about −50 dBFS) over a whole phrase is a silent microphone. */
export const SILENCE_RMS = 0.003;
/** More than this share of samples at full scale is clipping, not a loud peak. */
export const CLIPPED_SHARE = 0.002;
/** A call-out is a few seconds; longer is a conversation or an open microphone. */
export const MAX_PHRASE_SECONDS = 10;

export function newStats(): UtteranceStats {
	return { samples: 0, sumSquares: 0, clipped: 0 };
}

export function addBlock(stats: UtteranceStats, block: Float32Array): void {
	let sum = 0;
	let clipped = 0;
	for (let i = 0; i < block.length; i++) {
		const x = block[i];
		sum += x * x;
		if (x >= CLIP_LEVEL || x <= -CLIP_LEVEL) clipped++;
	}
	stats.samples += block.length;
	stats.sumSquares += sum;
	stats.clipped += clipped;
}

/** Why this phrase's audio should not be decoded, or null when it may be. */
export function utteranceProblem(
	stats: UtteranceStats,
	sampleRate: number,
	maxSeconds = MAX_PHRASE_SECONDS
): UtteranceProblem | null {
	if (stats.samples === 0 || Math.sqrt(stats.sumSquares / stats.samples) < SILENCE_RMS) {
		return {
			reason: 'silence',
			message:
				'Nothing was heard: the microphone is silent. Check it is switched on and close to you.'
		};
	}
	if (stats.clipped / stats.samples > CLIPPED_SHARE) {
		return {
			reason: 'clipped',
			message:
				'The sound was too loud and clipped, so it was not read. Hold the microphone a little further away or turn its gain down, then say it again.'
		};
	}
	if (stats.samples / sampleRate >= maxSeconds) {
		return {
			reason: 'too_long',
			message: `That went on for over ${maxSeconds} seconds, too long for one call-out, so it was not read. Say one step and its value at a time.`
		};
	}
	return null;
}
