// A new deploy is picked up on the next load with the network on: the browser checks the
// service worker by itself only now and then, so every full page load asks it to look now. The
// new worker takes over at once (src/service-worker.ts); offline the check fails quietly.
import type { ClientInit } from '@sveltejs/kit';

export const init: ClientInit = () => {
	if (!('serviceWorker' in navigator) || !navigator.onLine) return;
	void navigator.serviceWorker
		.getRegistration()
		.then((r) => r?.update())
		.catch(() => {});
};
