import type { Handle, HandleServerError } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { hasNul, nulMessage } from '$lib/nul';
import { lucia } from '$lib/server/auth';

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

export const handle = sequence(securityHeaders, refuseNul, handleAuth);

export const handleError: HandleServerError = ({ error, status, message }) => {
	// Below 500 the request was at fault (no such page, a body SvelteKit cannot take): say so in
	// SvelteKit's words ("Unsupported Media Type", "Payload Too Large"), and log nothing.
	if (status < 500) return { message };
	const reference = crypto.randomUUID().slice(0, 8);
	console.error(`[${reference}]`, error);
	return {
		message:
			'Something went wrong on the server. Try again; if it keeps happening, give the shop owner this reference.',
		reference
	};
};
