/**
 * Hands-free listening as a small state machine: once on, the recogniser is kept listening,
 * started again whenever it ends (browser recognisers stop by themselves after a pause), with
 * a growing wait after errors, and given up after a few errors in a row with the reason shown.
 * Pressing the microphone pauses it; pressing it again resumes. Pure: effects are returned,
 * the Bench carries them out.
 */

export interface HandsFreeState {
	on: boolean;
	listening: boolean;
	/** Errors since the last phrase heard or the last start by hand. */
	errors: number;
	/** Why listening is held: 'paused' by the technician, or the last error's words. */
	held: string | null;
}

export type HandsFreeEvent =
	| { type: 'turn_on' }
	| { type: 'turn_off' }
	| { type: 'started' }
	| { type: 'ended' }
	| { type: 'error'; message: string }
	| { type: 'heard' }
	| { type: 'pause' }
	| { type: 'resume' };

export type HandsFreeEffect =
	{ type: 'start' } | { type: 'stop' } | { type: 'start_after'; ms: number } | null;

/** Errors in a row before hands-free stops trying and says why. */
export const MAX_ERRORS = 3;
const FIRST_WAIT_MS = 250;
const MAX_WAIT_MS = 4000;

export const initialHandsFree: HandsFreeState = {
	on: false,
	listening: false,
	errors: 0,
	held: null
};

/** How long to wait before listening again after `errors` errors in a row. */
export function restartWait(errors: number): number {
	return Math.min(MAX_WAIT_MS, FIRST_WAIT_MS * 2 ** errors);
}

export function handsFreeStep(
	s: HandsFreeState,
	e: HandsFreeEvent
): [HandsFreeState, HandsFreeEffect] {
	switch (e.type) {
		case 'turn_on':
			return [{ ...s, on: true, errors: 0, held: null }, s.listening ? null : { type: 'start' }];
		case 'turn_off':
			return [{ ...s, on: false, held: null }, s.listening ? { type: 'stop' } : null];
		case 'started':
			return [{ ...s, listening: true }, null];
		case 'ended': {
			const next = { ...s, listening: false };
			if (!s.on || s.held) return [next, null];
			return [next, { type: 'start_after', ms: restartWait(s.errors) }];
		}
		case 'error': {
			const errors = s.errors + 1;
			if (!s.on) return [{ ...s, errors }, null];
			if (errors >= MAX_ERRORS) {
				return [{ ...s, errors, held: e.message }, s.listening ? { type: 'stop' } : null];
			}
			return [{ ...s, errors }, null];
		}
		case 'heard':
			return [{ ...s, errors: 0 }, null];
		case 'pause':
			if (!s.on) return [s, s.listening ? { type: 'stop' } : null];
			return [{ ...s, held: 'paused' }, s.listening ? { type: 'stop' } : null];
		case 'resume':
			return [{ ...s, errors: 0, held: null }, s.listening ? null : { type: 'start' }];
	}
}
