import { describe, expect, it } from 'vitest';
import { OfflineVoice } from './offline.svelte';
import { VoiceSettings, pickRecogniser, voiceAvailable } from './settings.svelte';

function FakeRecognition() {}
const withOffline = {
	WebAssembly: {},
	AudioWorkletNode: function () {},
	navigator: { mediaDevices: { getUserMedia: () => Promise.resolve() } }
};
const cloud = { webkitSpeechRecognition: FakeRecognition };
const onDevice = {
	SpeechRecognition: Object.assign(function () {}, {
		available: () => Promise.resolve('available')
	})
};

function setup(choice: VoiceSettings['choice'], loaded = false) {
	const s = new VoiceSettings();
	s.choice = choice;
	const offline = new OfflineVoice();
	if (loaded) offline.state = 'ready';
	return { s, offline };
}

describe('pickRecogniser', () => {
	it('automatic: on-device browser recognition first', async () => {
		const { s, offline } = setup('auto', true);
		const f = await pickRecogniser(s, offline, { ...withOffline, ...onDevice });
		expect(f?.description).toBe('the browser’s speech recognition');
	});
	it('automatic: offline voice once loaded, before the cloud', async () => {
		const { s, offline } = setup('auto', true);
		const f = await pickRecogniser(s, offline, { ...withOffline, ...cloud });
		expect(f?.description).toBe('offline voice on this device');
		expect(s.using).toBe('offline voice on this device');
	});
	it('automatic: the cloud when offline voice is not loaded', async () => {
		const { s, offline } = setup('auto');
		const f = await pickRecogniser(s, offline, { ...withOffline, ...cloud });
		expect(f?.description).toBe('the browser’s speech recognition');
	});
	it('automatic: offline voice when the browser has no recognition', async () => {
		const { s, offline } = setup('auto');
		const f = await pickRecogniser(s, offline, withOffline);
		expect(f?.description).toBe('offline voice on this device');
	});
	it('a fixed choice is kept, and is null where it cannot run', async () => {
		expect(
			(
				await pickRecogniser(setup('offline').s, setup('offline').offline, {
					...withOffline,
					...cloud
				})
			)?.description
		).toBe('offline voice on this device');
		expect(await pickRecogniser(setup('offline').s, setup('offline').offline, cloud)).toBeNull();
		expect(
			await pickRecogniser(setup('browser').s, setup('browser').offline, withOffline)
		).toBeNull();
		expect(voiceAvailable({})).toBe(false);
		expect(voiceAvailable(withOffline)).toBe(true);
	});
	it('passes push-to-talk on to offline voice', async () => {
		const { s, offline } = setup('offline');
		s.setNoisy(true);
		expect(s.pushToTalk).toBe(true);
		await pickRecogniser(s, offline, withOffline);
		expect(offline.pushToTalk).toBe(true);
	});
});

function memoryStorage() {
	const store = new Map<string, string>();
	const storage = {
		getItem: (k: string) => store.get(k) ?? null,
		setItem: (k: string, v: string) => void store.set(k, v)
	};
	return { store, storage };
}

describe('VoiceSettings', () => {
	it('restores what was saved and ignores anything else', () => {
		const { store, storage } = memoryStorage();
		const a = new VoiceSettings();
		a.choice = 'offline';
		a.pushToTalk = true;
		a.save(storage);
		const b = new VoiceSettings();
		b.restore(storage);
		expect([b.choice, b.pushToTalk, b.noisy]).toEqual(['offline', true, false]);
		store.set('benchcall-voice', '{"choice":"elsewhere"');
		const c = new VoiceSettings();
		c.restore(storage);
		expect(c.choice).toBe('auto');
	});
	it('hands-free is off by default, kept on the device, and excludes push-to-talk', () => {
		const { store, storage } = memoryStorage();
		const a = new VoiceSettings();
		expect(a.handsFree).toBe(false);
		a.setPushToTalk(true);
		a.setHandsFree(true);
		expect([a.handsFree, a.pushToTalk]).toEqual([true, false]);
		a.save(storage);
		const b = new VoiceSettings();
		b.restore(storage);
		expect(b.handsFree).toBe(true);
		b.setNoisy(true);
		expect([b.handsFree, b.pushToTalk]).toEqual([false, true]);
		// a hand-edited store with both on keeps the key: push-to-talk wins in a loud bay
		store.set('benchcall-voice', '{"pushToTalk":true,"handsFree":true}');
		const c = new VoiceSettings();
		c.restore(storage);
		expect([c.handsFree, c.pushToTalk]).toEqual([false, true]);
	});

	it('hands-free listens without a key even if push-to-talk was saved', async () => {
		const { s, offline } = setup('offline');
		s.pushToTalk = true;
		s.handsFree = true;
		await pickRecogniser(s, offline, withOffline);
		expect(offline.pushToTalk).toBe(false);
	});
});
