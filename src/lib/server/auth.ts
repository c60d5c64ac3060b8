import { dev } from '$app/environment';
import { env } from '$env/dynamic/private';
import { getRequestEvent } from '$app/server';
import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import { error, redirect } from '@sveltejs/kit';
import { and, eq, gt, sql } from 'drizzle-orm';
import { Lucia, TimeSpan, type DatabaseSession, type DatabaseUser } from 'lucia';
import type { Role } from '$lib/auth/roles';
import { decide, throttleWindowMinutes, type ThrottleDecision } from '$lib/auth/throttle';
import { failure, type Result } from '$lib/result';
import { client, db } from './db';
import { session, signInFailure, user } from './db/schema';
import { dummyHash, verifyPassword } from './password';

type SessionAndUser = [session: DatabaseSession | null, user: DatabaseUser | null];

/**
 * How long this process trusts a session it has read. Within that time a session is not read
 * again: under a burst (a Bench's outbox draining, every bay logging at once) the lookup was one
 * database round trip per request. This process forgets a session at once when it ends here
 * (sign-out, deactivation, a new password, expiry) and an account's sessions when its role or
 * state changes here (forgetUser); a change made through another app server, or in the database
 * directly, is seen here within this time.
 */
export const sessionCacheMs = 5_000;

/**
 * lucia's drizzle adapter with a short-lived cache of sessions read (see sessionCacheMs), and the
 * lookup as one prepared statement (postgres.js keeps it per connection): planned once, not
 * built by drizzle and planned by PostgreSQL each time.
 */
class SessionAdapter extends DrizzlePostgreSQLAdapter {
	readonly #read = new Map<string, { at: number; value: SessionAndUser }>();
	/** Bumped whenever a session or account is forgotten: a read that began before is not kept. */
	#epoch = 0;

	override async getSessionAndUser(sessionId: string): Promise<SessionAndUser> {
		const hit = this.#read.get(sessionId);
		if (hit && performance.now() - hit.at < sessionCacheMs) return hit.value;
		const epoch = this.#epoch;
		const at = performance.now();
		const value = await this.#lookup(sessionId);
		this.#read.delete(sessionId);
		if (value[0] && epoch === this.#epoch) {
			this.#read.set(sessionId, { at, value });
			this.#prune(at);
		}
		return value;
	}

	async #lookup(sessionId: string): Promise<SessionAndUser> {
		const [row] = await client`
			select s.id, s.user_id, s.expires_at, u.email, u.name, u.role, u.shop_id, u.active
			from session s join "user" u on u.id = s.user_id
			where s.id = ${sessionId}`;
		if (!row) return [null, null];
		return [
			{ id: row.id, userId: row.user_id, expiresAt: new Date(row.expires_at), attributes: {} },
			{
				id: row.user_id,
				attributes: {
					email: row.email,
					name: row.name,
					role: row.role,
					shopId: row.shop_id,
					active: row.active
				}
			}
		];
	}

	/** Entries are kept in the order read: drop the expired ones from the front. */
	#prune(now: number) {
		for (const [id, entry] of this.#read) {
			if (now - entry.at < sessionCacheMs) break;
			this.#read.delete(id);
		}
	}

	forgetUser(userId: string) {
		this.#epoch++;
		for (const [id, entry] of this.#read) {
			if (entry.value[0]?.userId === userId) this.#read.delete(id);
		}
	}

	override async updateSessionExpiration(sessionId: string, expiresAt: Date): Promise<void> {
		await super.updateSessionExpiration(sessionId, expiresAt);
		const hit = this.#read.get(sessionId);
		const [cached, owner] = hit?.value ?? [];
		if (hit && cached) hit.value = [{ ...cached, expiresAt }, owner ?? null];
	}

	// Forgotten before the delete (no request after this point trusts the cache) and again after
	// it (a read that began in between could still see the row, and is not kept).
	override async deleteSession(sessionId: string): Promise<void> {
		this.#forgetSession(sessionId);
		await super.deleteSession(sessionId);
		this.#forgetSession(sessionId);
	}

	override async deleteUserSessions(userId: string): Promise<void> {
		this.forgetUser(userId);
		await super.deleteUserSessions(userId);
		this.forgetUser(userId);
	}

	override async deleteExpiredSessions(): Promise<void> {
		await super.deleteExpiredSessions();
		this.#epoch++;
		this.#read.clear();
	}

	#forgetSession(sessionId: string) {
		this.#epoch++;
		this.#read.delete(sessionId);
	}
}

const adapter = new SessionAdapter(db, session, user);

/** Secure cookies whenever the app is served over https (ORIGIN tells adapter-node). */
const secure = !dev && (env.ORIGIN ?? '').startsWith('https://');

export const lucia = new Lucia(adapter, {
	// A working day and then some; renewed while in use (lucia renews in the second half).
	sessionExpiresIn: new TimeSpan(2, 'd'),
	// The cookie lives as long as the session it names (Max-Age from sessionExpiresIn, renewed
	// with it), not lucia's 400 days for `expires: false`.
	sessionCookie: {
		name: 'benchcall_session',
		attributes: { secure, sameSite: 'lax' }
	},
	getUserAttributes: (attributes) => ({
		email: attributes.email,
		name: attributes.name,
		role: attributes.role,
		shopId: attributes.shopId,
		active: attributes.active
	})
});

/**
 * After an account's role or state changed: this process reads its sessions afresh, so the
 * change applies to the very next request.
 */
export function forgetUser(userId: string) {
	adapter.forgetUser(userId);
}

declare module 'lucia' {
	interface Register {
		Lucia: typeof lucia;
		DatabaseUserAttributes: {
			email: string;
			name: string;
			role: Role;
			shopId: string;
			active: boolean;
		};
	}
}

export type SessionUser = {
	id: string;
	email: string;
	name: string;
	role: Role;
	shopId: string;
};

/**
 * The signed-in user, or: a redirect to sign-in for pages, 401 for API routes.
 * Layout loads do not protect actions or endpoints: every one calls this (or requireRole).
 */
export function requireUser(): SessionUser {
	const { locals, url } = getRequestEvent();
	if (!locals.user) {
		if (url.pathname.startsWith('/api/')) error(401, 'Sign in first.');
		redirect(303, `/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);
	}
	return locals.user;
}

/** The signed-in user when their role is one of `roles`; otherwise a 403. */
export function requireRole(...roles: Role[]): SessionUser {
	const current = requireUser();
	if (!roles.includes(current.role)) {
		error(403, 'Your role does not give access to this. Ask the shop owner if you need it.');
	}
	return current;
}

/** A throttled attempt (`too_many`) says when to try again. */
export type SignInResult = Result<{ userId: string; role: Role }, { retryAfterSeconds?: number }>;

const generic = 'That e-mail and password do not match an active account.';

/**
 * Checks a sign-in attempt with throttling by e-mail and address. The attempt is counted
 * before the password is checked, under a lock on the e-mail (one transaction), so parallel
 * tries cannot all slip under the limit; a right password then takes the count back.
 */
export async function checkSignIn(
	email: string,
	password: string,
	address: string
): Promise<SignInResult> {
	const reserved = await db.transaction(async (tx) => {
		await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${'sign-in ' + email}, 0))`);
		const decision = await throttleFor(tx, email, address);
		if (!decision.allowed) return { decision, attempt: null };
		const [attempt] = await tx
			.insert(signInFailure)
			.values({ email, address })
			.returning({ id: signInFailure.id });
		return { decision, attempt: attempt.id };
	});
	const { decision } = reserved;
	if (!decision.allowed) {
		return {
			...failure('too_many', decision.message),
			retryAfterSeconds: decision.retryAfterSeconds
		};
	}
	if (reserved.attempt === null) return failure('invalid', generic);
	const [row] = await db.select().from(user).where(eq(user.email, email)).limit(1);
	const valid = row
		? await verifyPassword(row.passwordHash, password)
		: (await verifyPassword(await dummyHash(), password), false);
	if (!row || !valid || !row.active) {
		if (decision.delayMs > 0) await new Promise((r) => setTimeout(r, decision.delayMs));
		const after = await throttleFor(db, email, address);
		const slowed = decision.delayMs > 0 || !after.allowed;
		return failure(
			'invalid',
			slowed ? `${generic} Repeated failures slow sign-in down for this e-mail.` : generic
		);
	}
	await db.delete(signInFailure).where(eq(signInFailure.email, email));
	return { ok: true, userId: row.id, role: row.role };
}

async function throttleFor(
	q: Pick<typeof db, 'select'>,
	email: string,
	address: string
): Promise<ThrottleDecision> {
	const since = sql`now() - make_interval(mins => ${throttleWindowMinutes})`;
	const [counts] = await q
		.select({
			email: sql<number>`count(*) filter (where ${signInFailure.email} = ${email} and ${signInFailure.address} = ${address})::int`,
			anywhere: sql<number>`count(*) filter (where ${signInFailure.email} = ${email})::int`,
			oldestAnywhere: sql<
				string | null
			>`min(${signInFailure.at}) filter (where ${signInFailure.email} = ${email})`,
			address: sql<number>`count(*) filter (where ${signInFailure.address} = ${address})::int`,
			oldestEmail: sql<
				string | null
			>`min(${signInFailure.at}) filter (where ${signInFailure.email} = ${email} and ${signInFailure.address} = ${address})`,
			oldestAddress: sql<
				string | null
			>`min(${signInFailure.at}) filter (where ${signInFailure.address} = ${address})`
		})
		.from(signInFailure)
		.where(
			and(
				gt(signInFailure.at, since),
				sql`(${signInFailure.email} = ${email} or ${signInFailure.address} = ${address})`
			)
		);
	return decide(
		{
			email: counts?.email ?? 0,
			emailAnywhere: counts?.anywhere ?? 0,
			oldestEmailAnywhereFailure: counts?.oldestAnywhere ? new Date(counts.oldestAnywhere) : null,
			address: counts?.address ?? 0,
			oldestEmailFailure: counts?.oldestEmail ? new Date(counts.oldestEmail) : null,
			oldestAddressFailure: counts?.oldestAddress ? new Date(counts.oldestAddress) : null
		},
		new Date()
	);
}
