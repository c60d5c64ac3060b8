/**
 * What the Bench does with a phrase a recogniser heard, before anything is logged: pick among
 * the recogniser's alternatives, ask the gate (confidence and plausibility), then confirm it,
 * ask to hear it again, or ignore it (hands-free shop talk). Pure: no Svelte, no browser.
 */

export type GateReason = 'low_confidence' | 'implausible_value' | 'wrong_scale' | 'not_understood';

/** The gate's answer for one phrase (the shape of `gate()` in ./gate). */
export type GateAnswer =
	{ ok: true } | { ok: false; reason: GateReason; heard: string; message: string };

/** One recognised phrase: its words and the recogniser's confidence 0…1 (null: none given). */
export interface Heard {
	text: string;
	confidence: number | null;
}

export type HeardOutcome =
	/** Goes to the confirm window (and is logged unless cancelled). */
	| { kind: 'confirm'; text: string }
	| { kind: 'cancel' }
	/** Not logged: the Bench shows and says "say it again" with what it heard. */
	| { kind: 'say_again'; heard: string; message: string; reason: GateReason }
	/** Hands-free only: not a command, or not heard well enough to be one. Shown faintly. */
	| { kind: 'ignored'; heard: string; reason: GateReason };

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
		message: answer.message,
		reason: answer.reason
	};
}

/** What the Bench reads aloud when it refuses a phrase. */
export function sayAgainWords(outcome: { heard: string; message: string }): string {
	const heard = outcome.heard.trim();
	return heard
		? `Say it again. I heard: ${heard}. ${outcome.message}`
		: `Say it again. ${outcome.message}`;
}
