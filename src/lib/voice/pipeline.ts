/**
 * One recorded call, end to end, the way the Bench hears it offline: check the audio, clean it
 * with RNNoise, decode it against the job's grammar, read it with the phrase engine and pass it
 * through the gate. The tests and `bench:voice` use exactly this; the browser does the same
 * steps with the denoiser running in its capture worklet.
 */
import { isCancel, parsePhrase, type ParsedPhrase, type StepSpec } from '../phrase/index';
import { checkPhraseAudio, SAMPLE_RATE, type AudioProblem } from './audio';
import { CaptureCore } from './capture';
import { decodePhrase, type Decoder, type HeardWord } from './decoder';
import { createDenoiser, denoisePhrase, type RnnoiseModule } from './denoise';
import type { Endpoint, Utterance } from './endpoint';
import { gatePhrase, type GateResult } from './gate';

export interface HeardCall {
	text: string;
	confidence: number;
	words: HeardWord[];
	/** Null when the audio was refused before decoding. */
	parsed: ParsedPhrase | null;
	/** Whether to act on it; refused calls carry the message for "say it again". */
	gate: GateResult;
	audioProblem: AudioProblem | null;
	/** Noise suppression plus decoding, milliseconds. */
	ms: number;
}

export interface HearOptions {
	/** RNNoise module; null or absent decodes the raw audio. */
	rnnoise?: RnnoiseModule | null;
	minConfidence?: number;
	tolerancePct?: number;
}

export function hearCall(
	decoder: Decoder,
	samples: Float32Array,
	steps: StepSpec[],
	opts: HearOptions = {}
): HeardCall {
	const bad = checkPhraseAudio(samples);
	if (bad) return refused(bad);
	const t0 = performance.now();
	const clean = opts.rnnoise ? denoisePhrase(opts.rnnoise, samples) : samples;
	const call = hearUtterance(decoder, { raw: samples, clean }, steps, opts);
	return { ...call, ms: performance.now() - t0 };
}

/**
 * Hands-free, as the Bench listens: a stream through the capture worklet's code (RNNoise as the
 * samples arrive) and an endpoint that cuts it into calls; each call heard as `hearCall` does.
 */
export function hearStream(
	decoder: Decoder,
	samples: Float32Array,
	steps: StepSpec[],
	endpoint: Endpoint,
	opts: HearOptions = {}
): HeardCall[] {
	const core = new CaptureCore(SAMPLE_RATE / 10);
	if (opts.rnnoise) core.useDenoiser(createDenoiser(opts.rnnoise));
	const calls: HeardCall[] = [];
	const hear = (u: Utterance | null) => {
		if (u) calls.push(hearUtterance(decoder, u, steps, opts));
	};
	try {
		for (let at = 0; at < samples.length; at += 128)
			for (const b of core.push(samples.subarray(at, at + 128)))
				hear(endpoint.push(b.raw, b.clean ?? b.raw));
		hear(endpoint.flush());
	} finally {
		core.destroy();
	}
	return calls;
}

/** One call already cut and cleaned: the raw samples are judged, the clean ones decoded. */
export function hearUtterance(
	decoder: Decoder,
	u: Utterance,
	steps: StepSpec[],
	opts: HearOptions = {}
): HeardCall {
	const bad = checkPhraseAudio(u.raw);
	if (bad) return refused(bad);
	const t0 = performance.now();
	const heard = decodePhrase(decoder, u.clean);
	const ms = performance.now() - t0;
	const parsed = parsePhrase(heard.text, { steps, tolerancePct: opts.tolerancePct });
	const step = steps.find((s) => s.id === parsed.stepId) ?? null;
	const gate = gatePhrase({
		heard: heard.text,
		parsed,
		step,
		confidence: heard.confidence,
		minConfidence: opts.minConfidence
	});
	return { ...heard, parsed, gate, audioProblem: null, ms };
}

function refused(bad: { problem: AudioProblem; message: string }): HeardCall {
	return {
		text: '',
		confidence: 0,
		words: [],
		parsed: null,
		gate: { ok: false, reason: 'not_understood', heard: '', message: bad.message },
		audioProblem: bad.problem,
		ms: 0
	};
}

/** Intents that write to the job log when accepted. */
export const LOGGING_INTENTS = new Set(['measure', 'part', 'note', 'done', 'undo']);

/**
 * Whether a heard call means what was said: the same intent, step, value and unit (and the
 * same words for a note or a part), as the phrase engine reads the two texts.
 */
export function sameCall(heard: string, said: string, steps: StepSpec[]): boolean {
	if (isCancel(said) || isCancel(heard)) return isCancel(said) && isCancel(heard);
	const a = parsePhrase(heard, { steps });
	const b = parsePhrase(said, { steps });
	return (
		a.intent === b.intent &&
		a.stepId === b.stepId &&
		(a.quantity?.value ?? null) === (b.quantity?.value ?? null) &&
		(a.quantity?.unit ?? null) === (b.quantity?.unit ?? null) &&
		(a.intent === 'note' || a.intent === 'part' ? a.note === b.note : true)
	);
}
