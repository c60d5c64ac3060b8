/// <reference types="@sveltejs/kit" />
/// <reference no-default-lib="true"/>
/// <reference lib="esnext" />
/// <reference lib="webworker" />
// The offline shell. The app's own files are kept per build; the Bench and the job data it reads
// are kept as last seen (network first, so an online load always gets the newest deploy); the
// offline voice model is kept across builds. Entries typed offline never pass through here:
// they wait in the Bench's outbox (IndexedDB) until a POST reaches the server.
import { build, files, version } from '$service-worker';
import {
	PAGE_CACHE,
	VOICE_CACHE,
	appCache,
	endsSession,
	offlineMessage,
	offlinePage,
	pageKeys,
	pagePolicy,
	staleCaches
} from '$lib/offline/pages';

const sw = self as unknown as ServiceWorkerGlobalScope;

const APP = appCache(version);
// the voice model has its own cache, fetched when voice is first switched on, not per deploy;
// the precompressed copies are the server's business
const appFiles = new Set(
	[...build, ...files].filter((p) => !p.startsWith('/voice-model/') && !/\.(br|gz)$/.test(p))
);

/** Fills this build's cache; a hashed file an earlier build already holds is not fetched again. */
async function keepAppFiles() {
	const cache = await caches.open(APP);
	const missing: string[] = [];
	for (const path of appFiles) {
		const hit = path.startsWith('/_app/immutable/') ? await caches.match(path) : undefined;
		if (hit) await cache.put(path, hit);
		else missing.push(path);
	}
	await cache.addAll(missing);
}

sw.addEventListener('install', (event) => {
	// a new build takes over at once: its pages are fetched fresh anyway (network first)
	event.waitUntil(keepAppFiles().then(() => sw.skipWaiting()));
});

sw.addEventListener('activate', (event) => {
	event.waitUntil(
		(async () => {
			for (const key of staleCaches(await caches.keys(), version)) await caches.delete(key);
			await sw.clients.claim();
		})()
	);
});

// the e2e test asks which build is in charge; a page that finds this build waiting tells it to
// take over (see hooks.client.ts)
sw.addEventListener('message', (event) => {
	if (event.data === 'version') event.source?.postMessage({ version });
	else if (event.data === 'take-over') event.waitUntil(sw.skipWaiting());
});

/** Fetches, and keeps a good answer (not a redirect to sign-in, not an error) under `keys`. */
async function fetchKeeping(request: Request, cacheName: string, keys: string[]) {
	const response = await fetch(request);
	if (response.ok && response.type === 'basic' && !response.redirected) {
		const cache = await caches.open(cacheName);
		for (const key of keys) await cache.put(key, response.clone());
	}
	return response;
}

async function cacheFirst(request: Request, cacheName: string) {
	const hit = await caches.match(request, { cacheName });
	return hit ?? fetchKeeping(request, cacheName, [new URL(request.url).pathname]);
}

function offline(request: Request, url: URL) {
	if (request.mode === 'navigate') {
		return new Response(offlinePage(url.pathname), {
			status: 503,
			headers: { 'content-type': 'text/html; charset=utf-8', 'cache-control': 'no-store' }
		});
	}
	return Response.json({ message: offlineMessage }, { status: 503 });
}

async function networkFirst(request: Request, url: URL) {
	const keys = pageKeys(url);
	try {
		return await fetchKeeping(request, PAGE_CACHE, keys);
	} catch {
		const cache = await caches.open(PAGE_CACHE);
		for (const key of keys) {
			const hit = await cache.match(key);
			if (hit) return hit;
		}
		return offline(request, url);
	}
}

async function networkOnly(request: Request, url: URL) {
	try {
		return await fetch(request);
	} catch {
		return offline(request, url);
	}
}

sw.addEventListener('fetch', (event) => {
	const { request } = event;
	const url = new URL(request.url);
	if (url.origin !== sw.location.origin) return;

	// signing out (or in as someone else) forgets every page kept for the person signed in
	if (endsSession(request.method, url)) {
		event.waitUntil(caches.delete(PAGE_CACHE));
		return;
	}
	if (request.method !== 'GET') return;
	if (request.headers.get('accept')?.includes('text/event-stream')) return;

	if (url.pathname.startsWith('/voice-model/')) {
		event.respondWith(cacheFirst(request, VOICE_CACHE));
	} else if (appFiles.has(url.pathname)) {
		event.respondWith(cacheFirst(request, APP));
	} else {
		const policy = pagePolicy(url, request.mode === 'navigate');
		if (policy === 'keep') event.respondWith(networkFirst(request, url));
		else if (policy === 'notice') event.respondWith(networkOnly(request, url));
	}
});
