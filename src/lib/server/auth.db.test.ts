import { eq } from 'drizzle-orm';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { checkSignIn, forgetUser, lucia, sessionCacheMs } from './auth';
import { db } from './db';
import { makeShop } from './db/fixtures';
import * as s from './db/schema';
import { setActive, setRole } from './staff';

afterEach(() => {
	vi.restoreAllMocks();
});

/** A technician of a new shop, signed in. */
async function signedIn() {
	const f = await makeShop('Sessions');
	const session = await lucia.createSession(f.tech.id, {});
	return { f, sessionId: session.id };
}

const roleOf = async (sessionId: string) => (await lucia.validateSession(sessionId)).user?.role;

describe('sessions read from the short-lived cache', () => {
	it('ends a signed-out session at the very next request', async () => {
		const { sessionId } = await signedIn();
		expect(await roleOf(sessionId)).toBe('technician'); // read, and now cached
		await lucia.invalidateSession(sessionId);
		expect((await lucia.validateSession(sessionId)).session).toBeNull();
	});

	it('applies a role change or a deactivation made here at the very next request', async () => {
		const { f, sessionId } = await signedIn();
		expect(await roleOf(sessionId)).toBe('technician');
		expect(await setRole(f.shop.id, f.tech.id, 'foreman')).toEqual({ ok: true });
		expect(await roleOf(sessionId)).toBe('foreman');
		expect(await setActive(f.shop.id, f.tech.id, false)).toEqual({ ok: true });
		expect((await lucia.validateSession(sessionId)).session).toBeNull();
	});

	it('sees a change made elsewhere (another server, the database) once the cache time is over', async () => {
		const { f, sessionId } = await signedIn();
		expect(await roleOf(sessionId)).toBe('technician');
		await db.update(s.user).set({ role: 'foreman' }).where(eq(s.user.id, f.tech.id));
		// within the cache time this process still trusts what it read ...
		expect(await roleOf(sessionId)).toBe('technician');
		// ... and no longer once it is over
		const now = performance.now();
		vi.spyOn(performance, 'now').mockReturnValue(now + sessionCacheMs + 1);
		expect(await roleOf(sessionId)).toBe('foreman');
	});

	it('does not keep a read that was under way while the account was forgotten', async () => {
		const { f, sessionId } = await signedIn();
		const underWay = lucia.validateSession(sessionId);
		forgetUser(f.tech.id);
		expect((await underWay).user?.role).toBe('technician');
		await db.update(s.user).set({ role: 'foreman' }).where(eq(s.user.id, f.tech.id));
		expect(await roleOf(sessionId)).toBe('foreman');
	});

	it('keeps no unknown session', async () => {
		const { f } = await signedIn();
		const missing = crypto.randomUUID().replaceAll('-', '');
		expect((await lucia.validateSession(missing)).session).toBeNull();
		// the same id made valid now: a miss was not kept, so it is read afresh
		await db
			.insert(s.session)
			.values({ id: missing, userId: f.tech.id, expiresAt: new Date(Date.now() + 3_600_000) });
		expect((await lucia.validateSession(missing)).user?.id).toBe(f.tech.id);
	});
});

describe('sign-in throttling against password guessing', () => {
	const wrong = (email: string, address: string) => checkSignIn(email, 'not the password', address);

	it('checks at most five of seven simultaneous wrong passwords for one e-mail', async () => {
		const email = `parallel-${crypto.randomUUID().slice(0, 8)}@test.test`;
		const results = await Promise.all(Array.from({ length: 7 }, () => wrong(email, '192.0.2.7')));
		const checked = results.filter((r) => !r.ok && r.retryAfterSeconds === undefined);
		const refused = results.filter((r) => !r.ok && r.retryAfterSeconds !== undefined);
		expect(checked).toHaveLength(5);
		expect(refused).toHaveLength(2);
	});

	it('counts failures per e-mail and address: another address is not locked out', async () => {
		const email = `pair-${crypto.randomUUID().slice(0, 8)}@test.test`;
		for (let i = 0; i < 5; i++)
			await db.insert(s.signInFailure).values({ email, address: '192.0.2.66' });
		const fromAttacker = await wrong(email, '192.0.2.66');
		expect(fromAttacker).toMatchObject({ ok: false, retryAfterSeconds: expect.any(Number) });
		const fromOwner = await wrong(email, '198.51.100.4');
		expect(fromOwner.ok).toBe(false);
		expect('retryAfterSeconds' in fromOwner && fromOwner.retryAfterSeconds).toBeFalsy();
	});
});

describe('the session cookie is hardened', () => {
	it('lives no longer than the server session it names', () => {
		const cookie = lucia.createSessionCookie('any-session-id');
		// Two days, as sessionExpiresIn: the cookie was 400 days with `expires: false`.
		expect(cookie.attributes.maxAge).toBe(2 * 24 * 60 * 60);
	});
});
