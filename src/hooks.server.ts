import type { Handle, HandleServerError, ServerInit } from '@sveltejs/kit';
import { building } from '$app/environment';
import { sequence } from '@sveltejs/kit/hooks';
import { hasNul, nulMessage } from '$lib/nul';
import { lucia } from '$lib/server/auth';
import { isDatabaseUnavailable } from '$lib/server/db/errors';
import { makeMissingCopies } from '$lib/server/photos';

/** Seconds a client is asked to wait (Retry-After) while the database is away. */
const retryAfterSeconds = 3;
const unavailableMessage =
	'The database is not answering for a moment (it may be restarting). Nothing was half-saved: try again in a few seconds.';
/** Requests that failed because the database was away: handleError marks them, `handle` answers 503. */
const databaseAway = new WeakSet<Request>();

const handleAuth: Handle = async ({ event, resolve }) => {
	const sessionId = event.cookies.get(lucia.sessionCookieName);
	event.locals.user = null;
	event.locals.session = null;
	if (!sessionId) return resolve(event);

	const { session, user } = await lucia.validateSession(sessionId);
	if (session && !user.active) {
		// A deactivated account's sessions end at once, even one made just before.
		await lucia.invalidateUserSessions(user.id);
	} else if (session) {
		if (session.fresh) {
			const cookie = lucia.createSessionCookie(session.id);
			event.cookies.set(cookie.name, cookie.value, { path: '.', ...cookie.attributes });
		}
		event.locals.user = {
			id: user.id,
			email: user.email,
			name: user.name,
			role: user.role,
			shopId: user.shopId
		};
		event.locals.session = session;
		return resolve(event);
	}
	const blank = lucia.createBlankSessionCookie();
	event.cookies.set(blank.name, blank.value, { path: '.', ...blank.attributes });
	return resolve(event);
};

const securityHeaders: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	response.headers.set('X-Content-Type-Options', 'nosniff');
	response.headers.set('Referrer-Policy', 'same-origin');
	response.headers.set('X-Frame-Options', 'DENY');
	response.headers.set('Permissions-Policy', 'camera=(self), microphone=(self), geolocation=()');
	// A signed-in page or JSON answer is this person's: no shared cache or back-button copy.
	const type = response.headers.get('content-type') ?? '';
	if (event.locals.user && /text\/html|application\/json|text\/event-stream/.test(type)) {
		try {
			response.headers.set('Cache-Control', 'private, no-store');
		} catch {
			// Immutable headers (a fetched response passed through): leave them.
		}
	}
	return response;
};

/** Text with a NUL cannot be stored or searched for: an address holding one is a 400. */
const refuseNul: Handle = ({ event, resolve }) => {
	const { url } = event;
	if (url.pathname.includes('%00') || [...url.searchParams].some((pair) => hasNul(pair))) {
		return new Response(nulMessage, {
			status: 400,
			headers: { 'content-type': 'text/plain; charset=utf-8' }
		});
	}
	return resolve(event);
};

/**
 * While PostgreSQL restarts or is stopped, every request that needs it fails. That is not a bug in
 * the request: answer 503 with Retry-After (not 500), so the Bench's outbox, a browser or a script
 * tries again, and the app needs no restart when the database is back (the pool reconnects).
 */
const databaseAvailability: Handle = async ({ event, resolve }) => {
	let response: Response;
	try {
		response = await resolve(event);
	} catch (err) {
		// Thrown before any route ran (the session check): SvelteKit would answer a bare 500.
		if (!isDatabaseUnavailable(err)) throw err;
		logUnavailable(err);
		return unavailable(event.request, event.url, event.isDataRequest);
	}
	if (response.status >= 500 && databaseAway.has(event.request)) {
		// A load, action or endpoint failed on the database: keep SvelteKit's error body.
		const headers = new Headers(response.headers);
		headers.set('retry-after', String(retryAfterSeconds));
		headers.set('cache-control', 'no-store');
		return new Response(response.body, { status: 503, headers });
	}
	return response;
};

function unavailable(request: Request, url: URL, isDataRequest: boolean): Response {
	const headers = { 'retry-after': String(retryAfterSeconds), 'cache-control': 'no-store' };
	const accept = request.headers.get('accept') ?? '';
	const wantsJson =
		isDataRequest ||
		url.pathname.startsWith('/api/') ||
		(accept.includes('application/json') && !accept.includes('text/html'));
	if (wantsJson) {
		return new Response(JSON.stringify({ message: unavailableMessage }), {
			status: 503,
			headers: { ...headers, 'content-type': 'application/json' }
		});
	}
	// The words of the error page (src/routes/+error.svelte), which cannot render without a route.
	const page = `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>Briefly unavailable · Benchcall</title></head><body style="font-family: system-ui, sans-serif; max-width: 36rem; margin: 4rem auto; padding: 0 1rem; line-height: 1.5"><p style="color: #666">Error 503</p><h1>Briefly unavailable</h1><p>${unavailableMessage}</p><p><a href="${url.pathname}">Try again</a></p></body></html>`;
	return new Response(page, {
		status: 503,
		headers: { ...headers, 'content-type': 'text/html; charset=utf-8' }
	});
}

/** One line, not a stack trace per request, while the database is away. */
function logUnavailable(err: unknown) {
	const e = err as { code?: string; cause?: { code?: string } };
	console.error(`database unavailable (${e.cause?.code ?? e.code ?? 'no code'}): answered 503`);
}

/**
 * Photos without a downscaled copy (stored before copies were recorded, or whose copy failed) get
 * one in the background, starting 10 s after the app, so no one has to know `photos:thumbs`.
 */
export const init: ServerInit = () => {
	if (!building) makeMissingCopies(10_000);
};

export const handle = sequence(securityHeaders, refuseNul, databaseAvailability, handleAuth);

export const handleError: HandleServerError = ({ error, event, status, message }) => {
	// Below 500 the request was at fault (no such page, a body SvelteKit cannot take): say so in
	// SvelteKit's words ("Unsupported Media Type", "Payload Too Large"), and log nothing.
	if (status < 500) return { message };
	if (isDatabaseUnavailable(error)) {
		databaseAway.add(event.request);
		logUnavailable(error);
		return { message: unavailableMessage };
	}
	const reference = crypto.randomUUID().slice(0, 8);
	console.error(`[${reference}]`, error);
	return {
		message:
			'Something went wrong on the server. Try again; if it keeps happening, give the shop owner this reference.',
		reference
	};
};
