/**
 * What the Bench does with a phrase a recogniser heard, before anything is logged: pick among
 * the recogniser's alternatives, ask the gate (confidence and plausibility), then confirm it,
 * ask to hear it again, or ignore it (hands-free shop talk). Pure: no Svelte, no browser.
 */

import type { Intent } from '../phrase/index';
import {
	MIN_CONFIDENCE,
	MIN_OUT_OF_SPEC_CONFIDENCE,
	type GateReason,
	type GateResult
} from './gate';

/** The gate's answer for one phrase, with what the phrase engine read it as. */
export type GateAnswer = GateResult & { intent: Intent };

/**
 * What hands-free acts on: a value for a step (logged after the confirm window) and the
 * questions that log nothing (next, spec, history). A recogniser that fits any sound to its
 * grammar turned shop talk into a note, a part or a done step with a confidence as high as a
 * real call's (three flite sentences before the grammar's out-of-grammar loop: 0.76–0.84
 * against 0.88–0.90), and a note takes any words, so those, and undo, need push-to-talk or the
 * keyboard.
 */
export const HANDS_FREE_INTENTS: ReadonlySet<Intent> = new Set([
	'measure',
	'next',
	'spec',
	'history'
]);

/** One recognised phrase: its words and the recogniser's confidence 0…1 (null: none given). */
export interface Heard {
	text: string;
	confidence: number | null;
	/** Heard by offline voice, whose confidence is on the decoder's own scale. */
	offline?: boolean;
}

/**
 * Lowest Web Speech confidence taken: engines report about 0.9 for a clear phrase and well
 * under 0.5 for a guess (from memory, not measured here: headless Chromium has no speech
 * recognition).
 */
export const WEB_SPEECH_MIN_CONFIDENCE = 0.5;

/**
 * The confidence and thresholds the gate judges a phrase by. Offline voice: its decoder's
 * confidence against the gate's own thresholds (a surer one for out-of-spec values). Web
 * Speech: its confidence against WEB_SPEECH_MIN_CONFIDENCE for any value (its scale is not
 * measured here), or, when the engine gave none, no confidence test at all (the value checks,
 * the confirm window and the read-back still apply).
 */
export function confidenceFor(h: Heard): {
	confidence: number;
	minConfidence: number;
	minOutOfSpecConfidence: number;
} {
	if (h.offline)
		return {
			confidence: h.confidence ?? 0,
			minConfidence: MIN_CONFIDENCE,
			minOutOfSpecConfidence: MIN_OUT_OF_SPEC_CONFIDENCE
		};
	if (h.confidence === null) return { confidence: 0, minConfidence: 0, minOutOfSpecConfidence: 0 };
	return {
		confidence: h.confidence,
		minConfidence: WEB_SPEECH_MIN_CONFIDENCE,
		minOutOfSpecConfidence: WEB_SPEECH_MIN_CONFIDENCE
	};
}

export type HeardOutcome =
	/** Goes to the confirm window (and is logged unless cancelled). */
	| { kind: 'confirm'; text: string }
	| { kind: 'cancel' }
	/**
	 * Put in the call bar to be checked and sent by hand, never logged by itself: a note heard
	 * by offline voice, whose grammar knows only a few dozen words besides the job's own, so a
	 * note it hears is often not what was said (voice corpus: most of its wrong entries); or a
	 * value out of spec heard without the surer confidence such a value needs (gate.ts).
	 */
	| { kind: 'check'; text: string; why: 'note' | 'unsure_out_of_spec' }
	/** Not logged: the Bench shows and says "say it again" with what it heard. */
	| { kind: 'say_again'; heard: string; message: string; reason: GateReason }
	/** Hands-free only: not a command it acts on, or not heard well enough. Shown faintly. */
	| { kind: 'ignored'; heard: string; reason: GateReason | 'not_hands_free' };

/**
 * A Web Speech confidence as a number 0…1, or null. Engines report 0 when they have no
 * estimate (Chrome's on-device engine, Safari), so 0 means "unknown", not "certainly wrong".
 */
export function speechConfidence(c: unknown): number | null {
	return typeof c === 'number' && Number.isFinite(c) && c > 0 && c <= 1 ? c : null;
}

/**
 * The alternative to act on, with the gate's answer for it. The engine's best guess comes
 * first; a later one is taken only when the gate passes it on its own confidence, which an
 * engine that gives none cannot do. When none passes, the best guess and its refusal are
 * returned, so the technician hears what was understood first.
 */
export function pickAlternative(
	alternatives: readonly Heard[],
	judge: (h: Heard) => GateAnswer
): { heard: Heard; answer: GateAnswer } | null {
	const list = alternatives.filter((a) => a.text.trim() !== '');
	if (!list.length) return null;
	const first = { heard: list[0], answer: judge(list[0]) };
	if (first.answer.ok) return first;
	for (const alt of list.slice(1)) {
		if (alt.confidence === null) continue;
		const answer = judge(alt);
		if (answer.ok) return { heard: alt, answer };
	}
	return first;
}

/**
 * Confirm, cancel, say again or ignore. Hands-free listens to everything said near the bench,
 * so what is not a command, or not heard well enough to be one, is ignored there rather than
 * answered; a clearly heard command with a value that cannot be right is still refused out loud.
 */
export function decideHeard(
	heard: Heard,
	answer: GateAnswer,
	opts: { handsFree: boolean; isCancel: (text: string) => boolean }
): HeardOutcome {
	const text = heard.text.trim();
	if (opts.isCancel(text)) return { kind: 'cancel' };
	if (answer.ok && opts.handsFree && !HANDS_FREE_INTENTS.has(answer.intent)) {
		return { kind: 'ignored', heard: text, reason: 'not_hands_free' };
	}
	if (answer.ok && answer.unsure) return { kind: 'check', text, why: 'unsure_out_of_spec' };
	if (answer.ok && heard.offline && answer.intent === 'note')
		return { kind: 'check', text, why: 'note' };
	if (answer.ok) return { kind: 'confirm', text };
	if (
		opts.handsFree &&
		(answer.reason === 'not_understood' || answer.reason === 'low_confidence')
	) {
		return { kind: 'ignored', heard: text, reason: answer.reason };
	}
	return {
		kind: 'say_again',
		heard: answer.heard || text,
		message: reasonOnly(answer.message),
		reason: answer.reason
	};
}

/**
 * The gate's reason without its own "Say it again — heard “…”." lead, for a screen that shows
 * the heading and the words heard on lines of their own.
 */
export function reasonOnly(message: string): string {
	return message.replace(/^Say it again — heard (“[^”]*”|nothing clear)\.\s*/, '');
}

/** What the Bench reads aloud when it refuses a phrase. */
export function sayAgainWords(outcome: { heard: string; message: string }): string {
	const heard = outcome.heard.trim();
	return heard
		? `Say it again. I heard: ${heard}. ${outcome.message}`
		: `Say it again. ${outcome.message}`;
}
