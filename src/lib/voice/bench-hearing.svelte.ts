/**
 * The Bench's ear between the recogniser and the confirm window: every phrase heard goes
 * through the gate (heard.ts) and only a passed one comes back to be confirmed; a refused one
 * is shown and said as "say it again", hands-free shop talk is listed faintly as ignored.
 * Also runs hands-free listening (hands-free.ts), carrying out its start and stop.
 */
import {
	decideHeard,
	pickAlternative,
	sayAgainWords,
	type GateAnswer,
	type Heard,
	type HeardOutcome
} from './heard';
import {
	handsFreeStep,
	initialHandsFree,
	type HandsFreeEvent,
	type HandsFreeState
} from './hands-free';

export interface HearingIO {
	/** Start the recogniser (hands-free: continuous, no key). */
	start(): void;
	/** Stop the recogniser. */
	stop(): void;
	/** Say words aloud where the device can; the screen shows them anyway. */
	speak(text: string): void;
}

/** How many ignored phrases stay listed. */
const IGNORED_KEPT = 3;

export class BenchHearing {
	/** The last refused phrase: shown (and said) until the next phrase or Esc. */
	sayAgain = $state<{ heard: string; message: string } | null>(null);
	/** Audio that was not read (silence, clipping, too long), with why. */
	unread = $state<string | null>(null);
	/** Hands-free phrases that were not commands, newest first. */
	ignored = $state<{ n: number; heard: string }[]>([]);
	handsFree = $state<HandsFreeState>(initialHandsFree);

	#io: HearingIO;
	#count = 0;
	#timer: ReturnType<typeof setTimeout> | undefined;

	constructor(io: HearingIO) {
		this.#io = io;
	}

	/**
	 * A finished phrase's alternatives: the outcome to act on. Only 'confirm' and 'cancel' are
	 * left to the caller; refusals and ignored phrases are handled here.
	 */
	hear(
		alternatives: readonly Heard[],
		judge: (h: Heard) => GateAnswer,
		isCancel: (text: string) => boolean
	): HeardOutcome | null {
		const picked = pickAlternative(alternatives, judge);
		if (!picked) return null;
		this.dispatch({ type: 'heard' });
		const out = decideHeard(picked.heard, picked.answer, {
			handsFree: this.handsFree.on,
			isCancel
		});
		this.unread = null;
		if (out.kind === 'say_again') {
			this.sayAgain = { heard: out.heard, message: out.message };
			this.#io.speak(sayAgainWords(out));
		} else if (out.kind === 'ignored') {
			this.ignored = [{ n: ++this.#count, heard: out.heard }, ...this.ignored].slice(
				0,
				IGNORED_KEPT
			);
		} else {
			this.sayAgain = null;
		}
		return out;
	}

	/**
	 * Audio the recogniser did not read. In hands-free, a click or a sound with nothing of this
	 * job in it is only shop noise: not worth a message.
	 */
	notRead(message: string, reason: string) {
		if (this.handsFree.on && (reason === 'nothing' || reason === 'too_short')) return;
		this.sayAgain = null;
		this.unread = message;
	}

	clear() {
		this.sayAgain = null;
		this.unread = null;
	}

	/** Feeds the hands-free state machine and carries out what it asks for. */
	dispatch(e: HandsFreeEvent) {
		const [next, effect] = handsFreeStep(this.handsFree, e);
		this.handsFree = next;
		if (!effect) return;
		clearTimeout(this.#timer);
		if (effect.type === 'start') this.#io.start();
		else if (effect.type === 'stop') this.#io.stop();
		else {
			this.#timer = setTimeout(() => {
				if (this.handsFree.on && !this.handsFree.held && !this.handsFree.listening) {
					this.#io.start();
				}
			}, effect.ms);
		}
	}

	destroy() {
		clearTimeout(this.#timer);
	}
}
