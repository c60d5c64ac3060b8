// Plain HTTP against the built server for the security checks: full control of cookies, the
// Origin header and redirects (never followed), and streams closed once their head is read.
import { demoPassword } from '../helpers/auth';

export const port = Number(process.env.BENCHCALL_TEST_PORT ?? 4173);
export const origin = `http://127.0.0.1:${port}`;
export const cookieName = 'benchcall_session';

export type Body =
	| { form: Record<string, string> }
	| { json: unknown }
	| { multipart: FormData }
	| { raw: string | Uint8Array; contentType?: string };

export interface Answer {
	status: number;
	location: string | null;
	headers: Headers;
	/** The body as text; empty for streams and binary files. */
	text: string;
	contentType: string;
}

export interface SendOptions {
	method?: string;
	/** The session cookie's value, if any. */
	session?: string | null;
	body?: Body;
	headers?: Record<string, string>;
	/** Defaults to the server's own origin (what a browser on the app's page sends). */
	origin?: string | null;
	base?: string;
}

const textual = /^(text\/(html|plain|csv)|application\/(json|schema\+json))/;

export async function send(path: string, opts: SendOptions = {}): Promise<Answer> {
	const base = opts.base ?? origin;
	const headers: Record<string, string> = { ...opts.headers };
	const method = opts.method ?? (opts.body ? 'POST' : 'GET');
	if (method !== 'GET' && opts.origin !== null) headers.origin ??= opts.origin ?? base;
	if (opts.session) headers.cookie = `${cookieName}=${opts.session}`;
	let body: BodyInit | undefined;
	const b = opts.body;
	if (b && 'form' in b) body = new URLSearchParams(b.form);
	else if (b && 'json' in b) {
		body = JSON.stringify(b.json);
		headers['content-type'] ??= 'application/json';
	} else if (b && 'multipart' in b) body = b.multipart;
	else if (b && 'raw' in b) {
		body = b.raw as BodyInit;
		if (b.contentType) headers['content-type'] = b.contentType;
	}
	const res = await fetch(base + path, { method, headers, body, redirect: 'manual' });
	const contentType = res.headers.get('content-type') ?? '';
	let text = '';
	if (contentType.startsWith('text/event-stream')) await res.body?.cancel();
	else if (contentType === '' || textual.test(contentType)) text = await res.text();
	else await res.arrayBuffer();
	return {
		status: res.status,
		location: res.headers.get('location'),
		headers: res.headers,
		text,
		contentType
	};
}

/** The session cookie a response sets (null when it sets none; '' when it clears it). */
export function sessionCookie(headers: Headers): string | null {
	for (const c of headers.getSetCookie()) {
		if (c.startsWith(cookieName + '=')) return c;
	}
	return null;
}

export function cookieValue(setCookie: string | null): string | null {
	if (setCookie === null) return null;
	return setCookie.slice(cookieName.length + 1).split(';')[0];
}

/** Signs in through the form action (as the browser's form post does); returns the session. */
export async function signInSession(
	email: string,
	password = demoPassword,
	opts: { session?: string | null; base?: string } = {}
): Promise<string> {
	const res = await send('/sign-in', {
		body: { form: { email, password } },
		headers: { accept: 'text/html' },
		session: opts.session,
		base: opts.base
	});
	const value = cookieValue(sessionCookie(res.headers));
	if (res.status !== 303 || !value) {
		throw new Error(`sign-in as ${email} answered ${res.status} without a session`);
	}
	return value;
}
