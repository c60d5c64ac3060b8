import { describe, expect, it } from 'vitest';
import {
	MAX_ERRORS,
	handsFreeStep,
	initialHandsFree,
	restartWait,
	type HandsFreeEvent,
	type HandsFreeState
} from './hands-free';

function run(events: HandsFreeEvent[], from: HandsFreeState = initialHandsFree) {
	let s = from;
	const effects = [];
	for (const e of events) {
		const [next, effect] = handsFreeStep(s, e);
		s = next;
		effects.push(effect);
	}
	return { s, effects };
}

describe('hands-free listening', () => {
	it('is off until turned on, and then starts listening', () => {
		expect(initialHandsFree.on).toBe(false);
		const { s, effects } = run([{ type: 'turn_on' }, { type: 'started' }]);
		expect(effects).toEqual([{ type: 'start' }, null]);
		expect(s).toMatchObject({ on: true, listening: true });
	});

	it('listens again whenever the recogniser ends by itself', () => {
		const { effects } = run([
			{ type: 'turn_on' },
			{ type: 'started' },
			{ type: 'ended' },
			{ type: 'started' },
			{ type: 'ended' }
		]);
		expect(effects[2]).toEqual({ type: 'start_after', ms: restartWait(0) });
		expect(effects[4]).toEqual({ type: 'start_after', ms: restartWait(0) });
	});

	it('waits longer after each error and gives up after a few in a row, with the reason', () => {
		const { s, effects } = run([
			{ type: 'turn_on' },
			{ type: 'started' },
			{ type: 'error', message: 'No microphone was found.' },
			{ type: 'ended' },
			{ type: 'started' },
			{ type: 'error', message: 'No microphone was found.' },
			{ type: 'ended' },
			{ type: 'started' },
			{ type: 'error', message: 'No microphone was found.' },
			{ type: 'ended' }
		]);
		expect(effects[3]).toEqual({ type: 'start_after', ms: restartWait(1) });
		expect(effects[6]).toEqual({ type: 'start_after', ms: restartWait(2) });
		expect(restartWait(2)).toBeGreaterThan(restartWait(1));
		expect(s.errors).toBe(MAX_ERRORS);
		expect(effects[8]).toEqual({ type: 'stop' });
		expect(effects[9]).toBeNull();
		expect(s.held).toBe('No microphone was found.');
		expect(restartWait(30)).toBe(4000);
	});

	it('a phrase heard clears the error count', () => {
		const { s } = run([
			{ type: 'turn_on' },
			{ type: 'started' },
			{ type: 'error', message: 'x' },
			{ type: 'error', message: 'x' },
			{ type: 'heard' },
			{ type: 'error', message: 'x' }
		]);
		expect(s).toMatchObject({ errors: 1, held: null, listening: true });
	});

	it('the microphone key pauses it (no restart) and resumes it', () => {
		const { s, effects } = run([
			{ type: 'turn_on' },
			{ type: 'started' },
			{ type: 'pause' },
			{ type: 'ended' },
			{ type: 'resume' }
		]);
		expect(effects.slice(2)).toEqual([{ type: 'stop' }, null, { type: 'start' }]);
		expect(s).toMatchObject({ on: true, held: null, errors: 0 });
	});

	it('turned off, it stops and never restarts', () => {
		const { s, effects } = run([
			{ type: 'turn_on' },
			{ type: 'started' },
			{ type: 'turn_off' },
			{ type: 'ended' },
			{ type: 'error', message: 'x' }
		]);
		expect(effects.slice(2)).toEqual([{ type: 'stop' }, null, null]);
		expect(s.on).toBe(false);
	});
});
