// Pure rules of the offline shell (used by src/service-worker.ts): which requests keep their
// last answer for offline use, under which keys, and the page shown when one cannot.

export type PagePolicy = 'keep' | 'notice' | 'pass';

const ENTRY_API = /^\/api\/jobs\/[0-9a-f-]{36}\/(steps|entries)$/i;

/**
 * What the service worker does with a same-origin GET:
 * - `keep`: the Bench and the job data it reads — network first, the last answer kept for
 *   offline (the Bench opens with the last job, its steps, cautions and log as last seen);
 * - `notice`: any other page, and the data of a page opened from within the app — network
 *   only; offline it says plainly that it needs the server (a stale Jobs list or invoice shown
 *   as if current would mislead);
 * - `pass`: everything else goes to the network untouched.
 */
export function pagePolicy(url: URL, navigate: boolean): PagePolicy {
	if (url.pathname === '/bench' || url.pathname === '/bench/__data.json') return 'keep';
	if (ENTRY_API.test(url.pathname) && !url.searchParams.has('before')) return 'keep';
	if (navigate || url.pathname.endsWith('/__data.json')) return 'notice';
	return 'pass';
}

/** Cache names: the app's files per build, pages as last seen, the voice model across builds. */
export const PAGE_CACHE = 'benchcall-pages';
export const VOICE_CACHE = 'benchcall-voice-model';
export const appCache = (version: string) => `benchcall-app-${version}`;

/** The caches a newly active build deletes: earlier builds' files; pages and the voice model stay. */
export function staleCaches(keys: readonly string[], version: string): string[] {
	const keep = new Set([appCache(version), PAGE_CACHE, VOICE_CACHE]);
	return keys.filter((k) => k.startsWith('benchcall-') && !keep.has(k));
}

/** Requests after which the pages kept for the person signed in must go (another may follow). */
export function endsSession(method: string, url: URL): boolean {
	return method === 'POST' && (url.pathname === '/sign-out' || url.pathname === '/sign-in');
}

/** What a data request that needs the server answers offline (SvelteKit shows the message). */
export const offlineMessage =
	'No connection: this page needs the server. The Bench works offline; reload this page when the network is back.';

/**
 * The cache keys a kept answer is stored under, most specific first; looked up in the same
 * order. A Bench page is also kept as "the last Bench page", so `/bench` opens the last job.
 * SvelteKit's `x-sveltekit-invalidated` marker does not change what is asked for.
 */
export function pageKeys(url: URL): string[] {
	const params = new URLSearchParams(url.search);
	params.delete('x-sveltekit-invalidated');
	params.sort();
	const q = params.toString();
	const exact = url.pathname + (q ? `?${q}` : '');
	if (url.pathname === '/bench' || url.pathname === '/bench/__data.json') {
		return exact === url.pathname ? [exact] : [exact, url.pathname];
	}
	return [exact];
}

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/** The page shown offline for a page that needs the server. Self-contained, no scripts. */
export function offlinePage(pathname: string): string {
	return `<!doctype html><html lang="en"><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Offline · Benchcall</title>
<style>body{font:18px/1.5 system-ui,sans-serif;margin:0;padding:2rem 1rem;background:#f4f6f7;color:#1c2226}
main{max-width:36rem;margin:auto}a{display:inline-flex;align-items:center;min-height:44px;padding:0 1rem;
border-radius:8px;background:#1c625f;color:#fff;font-weight:600;text-decoration:none}</style></head>
<body><main data-testid="offline-notice"><h1>No connection</h1>
<p><strong>${escapeHtml(pathname)}</strong> needs the server, and this device cannot reach it now.
Nothing is lost: reload this page when the network is back.</p>
<p>The Bench works without the network once it has been opened here: entries typed meanwhile
wait on this device and are sent when the connection returns.</p>
<p><a href="/bench">Open the Bench</a></p></main></body></html>`;
}
