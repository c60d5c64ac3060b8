// Sessions and cross-site requests, over plain HTTP against the built server. tests/auth.spec.ts
// already shows in the browser that sign-out and deactivation send a person back to sign-in;
// these check the cookie itself, fixation, every session of an account, and CSRF.
import { randomBytes, randomUUID } from 'node:crypto';
import { expect, test } from '@playwright/test';
import { db } from '../helpers/bench-db';
import { demo, demoPassword } from '../helpers/auth';
import { securityTargets } from './data';
import { cookieValue, send, sessionCookie, signInSession } from './http';

/** Whether a session opens the app: an API route answers 200 instead of 401. */
async function opens(session: string) {
	const status = (await send('/api/procedures/schema', { session })).status;
	if (status !== 200 && status !== 401) throw new Error(`unexpected ${status}`);
	return status === 200;
}

/** A form action as the app's forms send it; answers the action's own status. */
async function act(path: string, session: string, form: Record<string, string>, origin?: string) {
	const a = await send(path, {
		session,
		body: { form },
		origin,
		headers: { accept: 'application/json' }
	});
	if (!a.contentType.startsWith('application/json')) return a.status;
	const r = JSON.parse(a.text) as { type: string; status?: number };
	return r.status ?? a.status;
}

/** A new technician of the demo shop, made by the owner through the Shop page's action. */
async function newTechnician(owner: string) {
	const email = `session-${randomBytes(4).toString('hex')}@kettlestreet.test`;
	const password = `first-${randomBytes(6).toString('hex')}`;
	const status = await act('/shop?/create', owner, {
		name: 'Session Check',
		email,
		role: 'technician',
		password
	});
	expect(status).toBe(200);
	const [row] = await db()`select id from "user" where email = ${email}`;
	return { email, password, id: row.id as string };
}

test('the session cookie is HttpOnly, SameSite=Lax, Path=/, host-only; not Secure over http', async () => {
	const res = await send('/sign-in', {
		body: { form: { email: demo.ruth, password: demoPassword } },
		headers: { accept: 'text/html' }
	});
	expect(res.status).toBe(303);
	const cookie = sessionCookie(res.headers)!;
	expect(cookie).toBeTruthy();
	const attrs = cookie
		.split(';')
		.slice(1)
		.map((a) => a.trim().toLowerCase());
	expect(attrs).toContain('httponly');
	expect(attrs).toContain('samesite=lax');
	expect(attrs).toContain('path=/');
	// No Domain: the cookie goes back to this host only, never to sibling subdomains.
	expect(attrs.some((a) => a.startsWith('domain='))).toBe(false);
	// Served over plain http here (ORIGIN is http://…): a Secure cookie would never come back.
	// tests/security/headers.spec.ts proves it is Secure when ORIGIN is https.
	expect(attrs).not.toContain('secure');
	// 40 characters of lucia's id alphabet: not guessable, not a user id.
	expect(cookieValue(cookie)).toMatch(/^[a-z0-9]{40}$/);
});

test('sign-in never adopts a session id the browser brought (no fixation)', async () => {
	// 1. A value an attacker chose and planted: ignored, and a fresh id is issued.
	const planted = 'a'.repeat(40);
	const first = await signInSession(demo.ruth, undefined, { session: planted });
	expect(first).not.toBe(planted);
	expect(await opens(planted)).toBe(false);
	expect(await opens(first)).toBe(true);

	// 2. The attacker's own valid session planted in the victim's browser: signing in as the
	// victim ends it and issues a new one, so the attacker's copy never becomes the victim's.
	const attackers = await signInSession(demo.tomasz);
	const victims = await signInSession(demo.owner, undefined, { session: attackers });
	expect(victims).not.toBe(attackers);
	expect(await opens(attackers)).toBe(false);
	const staff = await send('/api/staff', { session: victims });
	expect(staff.status, 'the new session is the owner’s own').toBe(200);
	const [row] = await db()`select count(*)::int as n from session where id = ${attackers}`;
	expect(row.n).toBe(0);
});

test('sign-out ends that session at once, only by a same-site POST', async () => {
	const session = await signInSession(demo.writer);
	const other = await signInSession(demo.writer);
	// A link (GET) cannot sign anyone out, nor can another site's form.
	expect((await send('/sign-out', { session })).status).toBe(303);
	expect(await opens(session)).toBe(true);
	const forged = await send('/sign-out', {
		session,
		body: { form: {} },
		origin: 'https://elsewhere.example'
	});
	expect(forged.status).toBe(403);
	expect(await opens(session)).toBe(true);

	const out = await send('/sign-out', {
		session,
		body: { form: {} },
		headers: { accept: 'text/html' }
	});
	expect(out.status).toBe(303);
	expect(out.location).toBe('/sign-in');
	// The browser is told to drop the cookie, and a copy replayed opens nothing.
	const cleared = sessionCookie(out.headers)!;
	expect(cookieValue(cleared)).toBe('');
	expect(cleared.toLowerCase()).toMatch(/max-age=0|expires=thu, 01 jan 1970/);
	expect(await opens(session)).toBe(false);
	const [row] = await db()`select count(*)::int as n from session where id = ${session}`;
	expect(row.n).toBe(0);
	// The same person's session in another browser is theirs to end.
	expect(await opens(other)).toBe(true);
});

test('deactivation and a new password end every session of the account at once', async () => {
	const owner = await signInSession(demo.owner);
	const tech = await newTechnician(owner);
	const phone = await signInSession(tech.email, tech.password);
	const bench = await signInSession(tech.email, tech.password);
	expect(await opens(phone)).toBe(true);
	expect(await opens(bench)).toBe(true);

	expect(await act('/shop?/deactivate', owner, { userId: tech.id })).toBe(200);
	expect(await opens(phone)).toBe(false);
	expect(await opens(bench)).toBe(false);
	const [gone] = await db()`select count(*)::int as n from session where user_id = ${tech.id}`;
	expect(gone.n).toBe(0);
	// A deactivated account cannot sign in again, and reactivating brings no old session back.
	const refused = await send('/sign-in', {
		body: { form: { email: tech.email, password: tech.password } },
		headers: { accept: 'application/json' }
	});
	expect(sessionCookie(refused.headers)).toBeNull();
	expect(await act('/shop?/reactivate', owner, { userId: tech.id })).toBe(200);
	expect(await opens(phone)).toBe(false);

	const again = await signInSession(tech.email, tech.password);
	const password = `second-${randomBytes(6).toString('hex')}`;
	expect(await act('/shop?/password', owner, { userId: tech.id, password })).toBe(200);
	expect(await opens(again)).toBe(false);
	await expect(signInSession(tech.email, tech.password)).rejects.toThrow();
	expect(await opens(await signInSession(tech.email, password))).toBe(true);
	// The owner's own session is untouched by all this.
	expect(await opens(owner)).toBe(true);
});

test.describe('cross-site requests are refused (SvelteKit origin check)', () => {
	const evil = 'https://elsewhere.example';

	test('a form post from another origin, or with no Origin at all, answers 403', async () => {
		for (const origin of [evil, 'null', 'http://127.0.0.1:1']) {
			const res = await send('/sign-in', {
				body: { form: { email: demo.ruth, password: 'whatever-it-is' } },
				origin
			});
			expect(res.status, origin).toBe(403);
			expect(res.text).toContain('Cross-site POST form submissions are forbidden');
			expect(sessionCookie(res.headers)).toBeNull();
		}
		const bare = await send('/sign-in', {
			body: { form: { email: demo.ruth, password: 'whatever-it-is' } },
			origin: null
		});
		expect(bare.status).toBe(403);
	});

	test('a signed-in owner’s session cannot be used by another site to add an account', async () => {
		const owner = await signInSession(demo.owner);
		const email = `csrf-${randomBytes(4).toString('hex')}@kettlestreet.test`;
		const form = { name: 'Forged', email, role: 'owner', password: 'forged-password-1' };
		expect(await act('/shop?/create', owner, form, evil)).toBe(403);
		// Multipart and text/plain are form types too (what a plain HTML form can send).
		const fd = new FormData();
		for (const [k, v] of Object.entries(form)) fd.append(k, v);
		expect(
			(await send('/shop?/create', { session: owner, body: { multipart: fd }, origin: evil }))
				.status
		).toBe(403);
		const [row] = await db()`select count(*)::int as n from "user" where email = ${email}`;
		expect(row.n).toBe(0);
	});

	test('a JSON body sent as text/plain from another site logs nothing', async () => {
		const { kettle } = await securityTargets();
		const session = await signInSession(demo.owner);
		const id = randomUUID();
		const res = await send(`/api/jobs/${kettle.jobId}/entries`, {
			session,
			body: {
				raw: JSON.stringify({ id, text: 'note forged from elsewhere', source: 'typed' }),
				contentType: 'text/plain'
			},
			origin: evil
		});
		expect(res.status).toBe(403);
		const [row] = await db()`select count(*)::int as n from log_entry where id = ${id}`;
		expect(row.n).toBe(0);
	});
});
