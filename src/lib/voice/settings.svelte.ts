/**
 * Which recogniser the Bench listens with, push-to-talk and noisy mode, kept on this device.
 * 'auto': the browser's on-device speech recognition where it is installed, else offline
 * voice once it is loaded, else the browser's (cloud) speech recognition, else offline voice.
 */
import { OfflineVoice } from './offline.svelte';
import { webSpeech, type RecogniserFactory } from './recogniser';

export type VoiceChoice = 'auto' | 'browser' | 'offline';

const KEY = 'benchcall-voice';

export class VoiceSettings {
	choice = $state<VoiceChoice>('auto');
	noisy = $state(false);
	pushToTalk = $state(false);
	/**
	 * Hands-free: listens all the time, no key to hold, and acts only on phrases that read as a
	 * command with enough confidence. Off by default; push-to-talk is the way in a loud bay.
	 */
	handsFree = $state(false);
	/** Where the last phrase was recognised, for the screen. */
	using = $state('');

	restore(storage: Pick<Storage, 'getItem'> | undefined = globalThis.localStorage) {
		try {
			const saved = JSON.parse(storage?.getItem(KEY) ?? '{}') as Partial<VoiceSettings>;
			if (saved.choice === 'auto' || saved.choice === 'browser' || saved.choice === 'offline') {
				this.choice = saved.choice;
			}
			this.noisy = saved.noisy === true;
			this.pushToTalk = saved.pushToTalk === true;
			this.handsFree = saved.handsFree === true && !this.pushToTalk;
		} catch {
			// unreadable settings: keep the defaults
		}
	}

	save(storage: Pick<Storage, 'setItem'> | undefined = globalThis.localStorage) {
		const { choice, noisy, pushToTalk, handsFree } = this;
		storage?.setItem(KEY, JSON.stringify({ choice, noisy, pushToTalk, handsFree }));
	}

	/** Noisy mode turns push-to-talk on (it can still be turned off), and so hands-free off. */
	setNoisy(on: boolean) {
		this.noisy = on;
		if (on) this.setPushToTalk(true);
		this.save();
	}

	/** Push-to-talk and hands-free exclude each other: one holds a key, the other needs none. */
	setPushToTalk(on: boolean) {
		this.pushToTalk = on;
		if (on) this.handsFree = false;
		this.save();
	}

	setHandsFree(on: boolean) {
		this.handsFree = on;
		if (on) this.pushToTalk = false;
		this.save();
	}
}

export const voiceSettings = new VoiceSettings();
export const offlineVoice = new OfflineVoice();

/** True when the browser says its on-device recognition is installed for the language. */
export async function onDeviceSpeech(
	lang = 'en-US',
	win: Record<string, unknown> = globalThis as never
): Promise<boolean> {
	const Ctor = (win.SpeechRecognition ?? win.webkitSpeechRecognition) as
		| { available?: (o: { langs: string[]; processLocally: boolean }) => Promise<string> }
		| undefined;
	if (typeof Ctor?.available !== 'function') return false;
	try {
		return (await Ctor.available({ langs: [lang], processLocally: true })) === 'available';
	} catch {
		return false;
	}
}

/** True when some recogniser can run in this browser. */
export function voiceAvailable(win: Record<string, unknown> = globalThis as never): boolean {
	return webSpeech(win) !== null || OfflineVoice.supported(win);
}

/** The recogniser to listen with now, by the settings; null when there is none. */
export async function pickRecogniser(
	settings: VoiceSettings = voiceSettings,
	offline: OfflineVoice = offlineVoice,
	win: Record<string, unknown> = globalThis as never
): Promise<RecogniserFactory | null> {
	offline.pushToTalk = settings.pushToTalk && !settings.handsFree;
	const browser = webSpeech(win);
	const canOffline = OfflineVoice.supported(win);
	let pick: RecogniserFactory | null;
	if (settings.choice === 'offline') pick = canOffline ? offline.factory() : null;
	else if (settings.choice === 'browser') pick = browser;
	else if (browser && (await onDeviceSpeech('en-US', win))) pick = browser;
	else if (offline.state === 'ready') pick = offline.factory();
	else pick = browser ?? (canOffline ? offline.factory() : null);
	settings.using = pick?.description ?? '';
	return pick;
}
