/**
 * The gate between hearing and logging. A recogniser that is unsure, or a value that no
 * technician would call out for the step (more than 3× outside its spec band, or a unit one
 * metric prefix away from the step's own, the classic mishearing of "metres" as
 * "millimetres"), must not reach the job log: the Bench asks to say it again and shows what it
 * heard. Pure and framework-free; the offline decoder and the browser's Web Speech results
 * (which carry their own confidence) both pass through it.
 *
 * Out-of-spec values that are plausible (a chain at 40 mm on a 25–35 mm step) are findings,
 * not mishearings: they pass with their verdict. Heard with less than `minOutOfSpecConfidence`
 * they pass marked `unsure`, and the Bench puts them in the call bar to be checked rather than
 * logging them by itself: a near number heard for the one said ("thirteen" for "thirty") is
 * what remains of the offline decoder's mishearings, and it lands out of spec more often than
 * in it.
 */
import { z } from 'zod';
import { convert } from '../units/index';
import { isCancel, type ParsedPhrase, type StepSpec } from '../phrase/index';
import { isWrongScale } from './scale';

export { isWrongScale };

export type GateReason = 'low_confidence' | 'implausible_value' | 'wrong_scale' | 'not_understood';

export type GateResult =
	{ ok: true; unsure?: true } | { ok: false; reason: GateReason; heard: string; message: string };

export interface GateInput {
	/** The words as heard (shown back to the technician). */
	heard: string;
	/** `parsePhrase(heard, …)`. */
	parsed: ParsedPhrase;
	/** The step the phrase names (parsed.stepId's spec), or null. */
	step: StepSpec | null | undefined;
	/** The recogniser's confidence, 0…1; anything else counts as 0. */
	confidence: number;
	/** Lowest confidence accepted; the default suits the offline decoder. */
	minConfidence?: number;
	/**
	 * Below this, a value outside the step's spec (under or over) passes `unsure`: to be checked
	 * by hand. The default suits the offline decoder.
	 */
	minOutOfSpecConfidence?: number;
}

/**
 * Default lowest confidence for the offline decoder (`decodePhrase`), chosen on the corpus's
 * tuning split (README, Voice). Web Speech confidences are on another scale: pass your own.
 */
export const MIN_CONFIDENCE = 0.75;
/**
 * Default confidence under which an out-of-spec value from the offline decoder is `unsure`,
 * chosen on the corpus's tuning split: from 0.88 to 0.92 it kept 2 of its 3 wrong values out
 * of the log (README, Voice, gives the held-out split's figures). The corpus has no right
 * out-of-spec call to count the cost on; two thirds of its right calls score under 0.9, so
 * expect most out-of-spec calls to wait for Enter.
 */
export const MIN_OUT_OF_SPEC_CONFIDENCE = 0.9;
/** A value more than this factor outside the step's band is taken as a mishearing. */
export const PLAUSIBLE_FACTOR = 3;

const NON_LOGGING = new Set(['next', 'spec', 'history']);

const inputSchema = z.object({
	heard: z.string().max(500),
	confidence: z.number().catch(0),
	minConfidence: z.number().min(0).max(1).optional(),
	minOutOfSpecConfidence: z.number().min(0).max(1).optional()
});

function quote(heard: string): string {
	const h = heard.trim();
	return h ? `“${h.length > 80 ? h.slice(0, 79) + '…' : h}”` : 'nothing clear';
}

function refuse(reason: GateReason, heard: string, why: string): GateResult {
	return { ok: false, reason, heard, message: `Say it again — heard ${quote(heard)}. ${why}` };
}

/** The step's band in its own unit: min/max, else the band the phrase engine judged against. */
function bandOf(parsed: ParsedPhrase, step: StepSpec): { lo: number | null; hi: number | null } {
	const lo = step.min ?? parsed.band?.min ?? step.nominal ?? null;
	const hi = step.max ?? parsed.band?.max ?? step.nominal ?? null;
	return { lo, hi };
}

export function gatePhrase(input: GateInput): GateResult {
	const checked = inputSchema.safeParse(input);
	const heard = checked.success ? checked.data.heard : String(input?.heard ?? '').slice(0, 500);
	if (!checked.success || !input.parsed)
		return refuse('not_understood', heard, 'That could not be read as a call.');
	const conf = Number.isFinite(checked.data.confidence)
		? Math.max(0, Math.min(1, checked.data.confidence))
		: 0;
	const min = checked.data.minConfidence ?? MIN_CONFIDENCE;
	const { parsed } = input;

	if (!heard.trim()) return refuse('not_understood', heard, 'Nothing was understood.');
	if (conf < min) return refuse('low_confidence', heard, 'Not sure I heard that right.');
	if (isCancel(heard) || NON_LOGGING.has(parsed.intent)) return { ok: true };
	if (parsed.intent === 'unknown')
		return refuse('not_understood', heard, 'That is not a call Benchcall knows.');
	if (parsed.intent !== 'measure') return { ok: true };

	const step = input.step;
	const q = parsed.quantity;
	if (!step || !q || !Number.isFinite(q.value))
		return refuse('not_understood', heard, 'Name the step and the value.');
	if (step.unit && q.unit !== '1' && isWrongScale(q.unit, step.unit))
		return refuse(
			'wrong_scale',
			heard,
			'That unit is not the step’s scale; say the value with its unit again.'
		);
	let value = parsed.specValue?.value ?? null;
	if (value === null && step.unit && q.unit !== '1') {
		try {
			value = convert(q.value, q.unit, step.unit);
		} catch {
			return refuse('wrong_scale', heard, 'That unit does not measure this step.');
		}
	}
	value ??= q.value;
	const { lo, hi } = bandOf(parsed, step);
	const tooHigh = hi !== null && hi > 0 && value > hi * PLAUSIBLE_FACTOR;
	const tooLow = lo !== null && lo > 0 && value < lo / PLAUSIBLE_FACTOR;
	if (tooHigh || tooLow)
		return refuse(
			'implausible_value',
			heard,
			'That value is far outside this step’s spec; check it and say it again.'
		);
	const outOfSpec = parsed.verdict === 'low' || parsed.verdict === 'high';
	const minOut = checked.data.minOutOfSpecConfidence ?? MIN_OUT_OF_SPEC_CONFIDENCE;
	return outOfSpec && conf < minOut ? { ok: true, unsure: true } : { ok: true };
}
