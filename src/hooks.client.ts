// A new deploy is picked up on the next load with the network on: the browser checks the
// service worker by itself only now and then, so every full page load asks it to look now. The
// new worker takes over at once (src/service-worker.ts); offline the check fails quietly.
// `navigator.onLine` is no guide here: a device whose only network is its own loopback (the
// server on the same laptop) reports false while the server answers.
//
// A worker that asked to take over during its install can still be left waiting: Chromium
// hands over once the old worker is idle, and a request that reaches the old worker at that
// moment restarts it and parks the new one (seen in tests/offline.spec.ts). So while a build
// waits, the page asks it again every few seconds; a message to the waiting worker is no work
// for the old one.
import type { ClientInit } from '@sveltejs/kit';

const NUDGE_MS = 3_000;
const NUDGES = 100;

function nudge(r: ServiceWorkerRegistration) {
	let left = NUDGES;
	const timer = setInterval(() => {
		if (!r.waiting || --left < 0) clearInterval(timer);
		else r.waiting.postMessage('take-over');
	}, NUDGE_MS);
	r.waiting?.postMessage('take-over');
}

export const init: ClientInit = () => {
	if (!('serviceWorker' in navigator)) return;
	void navigator.serviceWorker
		.getRegistration()
		.then(async (r) => {
			if (!r) return;
			r.addEventListener('updatefound', () => {
				const next = r.installing;
				next?.addEventListener('statechange', () => {
					if (next.state === 'installed') nudge(r);
				});
			});
			if (r.waiting) nudge(r);
			await r.update();
		})
		.catch(() => {});
};
