// A new deploy is picked up on the next load with the network on: the browser checks the
// service worker by itself only now and then, so every full page load asks it to look now. The
// new worker takes over at once (src/service-worker.ts); offline the check fails quietly.
// `navigator.onLine` is no guide here: a device whose only network is its own loopback (the
// server on the same laptop) reports false while the server answers.
//
// A worker that asked to take over during its install can still be left waiting: Chromium
// hands over once the old worker is idle and may miss that moment while a page keeps it busy
// (seen in tests/offline.spec.ts). So a page that sees a build waiting asks it again.
import type { ClientInit } from '@sveltejs/kit';

function takeOver(worker: ServiceWorker | null) {
	if (worker?.state === 'installed') worker.postMessage('take-over');
}

export const init: ClientInit = () => {
	if (!('serviceWorker' in navigator)) return;
	void navigator.serviceWorker
		.getRegistration()
		.then(async (r) => {
			if (!r) return;
			r.addEventListener('updatefound', () => {
				const next = r.installing;
				next?.addEventListener('statechange', () => takeOver(next));
			});
			takeOver(r.waiting);
			await r.update();
			takeOver(r.waiting);
		})
		.catch(() => {});
};
