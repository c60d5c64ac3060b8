import { describe, expect, it } from 'vitest';
import { webSpeech, type RecogniserEvents } from './recogniser';

/** A stand-in for the browser's SpeechRecognition, with or without the audiostart event. */
function fakeEngine(withAudioStart: boolean) {
	const made: Record<string, unknown>[] = [];
	class Engine {
		lang = '';
		continuous = false;
		interimResults = false;
		maxAlternatives = 1;
		onresult = null;
		onerror = null;
		onend = null;
		started = false;
		constructor() {
			if (withAudioStart) (this as Record<string, unknown>).onaudiostart = null;
			made.push(this as unknown as Record<string, unknown>);
		}
		start() {
			this.started = true;
		}
		stop() {}
	}
	return { win: { SpeechRecognition: Engine }, made };
}

function events(log: string[]): RecogniserEvents {
	return {
		onReady: () => log.push('ready'),
		onInterim: () => {},
		onFinal: () => {},
		onError: (m) => log.push('error ' + m),
		onEnd: () => log.push('end')
	};
}

describe('Web Speech: when the Bench may say it is listening', () => {
	it('waits for the engine to say the microphone’s sound has started', async () => {
		const { win, made } = fakeEngine(true);
		const log: string[] = [];
		const rec = await webSpeech(win)!.create({ lang: 'en-US', phrases: [], events: events(log) });
		rec.start();
		expect(made[0].started).toBe(true);
		expect(log).toEqual([]);
		(made[0].onaudiostart as () => void)();
		expect(log).toEqual(['ready']);
	});

	it('an engine without that event is ready once started', async () => {
		const { win } = fakeEngine(false);
		const log: string[] = [];
		const rec = await webSpeech(win)!.create({ lang: 'en-US', phrases: [], events: events(log) });
		expect(log).toEqual([]);
		rec.start();
		expect(log).toEqual(['ready']);
	});
});
