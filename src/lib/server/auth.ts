import { dev } from '$app/environment';
import { env } from '$env/dynamic/private';
import { getRequestEvent } from '$app/server';
import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import { error, redirect } from '@sveltejs/kit';
import { and, eq, gt, sql } from 'drizzle-orm';
import { Lucia, TimeSpan, type DatabaseSession, type DatabaseUser } from 'lucia';
import type { Role } from '$lib/auth/roles';
import { decide, throttleWindowMinutes, type ThrottleDecision } from '$lib/auth/throttle';
import { client, db } from './db';
import { session, signInFailure, user } from './db/schema';
import { dummyHash, verifyPassword } from './password';

/**
 * Every request looks its session up, so that one query is a prepared statement (postgres.js
 * keeps it per connection): planned once, not built by drizzle and planned by PostgreSQL each
 * time. The rest of the adapter is lucia's own.
 */
class SessionAdapter extends DrizzlePostgreSQLAdapter {
	override async getSessionAndUser(
		sessionId: string
	): Promise<[session: DatabaseSession | null, user: DatabaseUser | null]> {
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
}

const adapter = new SessionAdapter(db, session, user);

/** Secure cookies whenever the app is served over https (ORIGIN tells adapter-node). */
const secure = !dev && (env.ORIGIN ?? '').startsWith('https://');

export const lucia = new Lucia(adapter, {
	// A working day and then some; renewed while in use (lucia renews in the second half).
	sessionExpiresIn: new TimeSpan(2, 'd'),
	sessionCookie: {
		name: 'benchcall_session',
		expires: false,
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

export type SignInResult =
	| { ok: true; userId: string; role: Role }
	| { ok: false; message: string; retryAfterSeconds?: number };

const generic = 'That e-mail and password do not match an active account.';

/** Checks a sign-in attempt with throttling by e-mail and address. */
export async function checkSignIn(
	email: string,
	password: string,
	address: string
): Promise<SignInResult> {
	const decision = await throttleFor(email, address);
	if (!decision.allowed)
		return { ok: false, message: decision.message, retryAfterSeconds: decision.retryAfterSeconds };
	const [row] = await db.select().from(user).where(eq(user.email, email)).limit(1);
	const valid = row
		? await verifyPassword(row.passwordHash, password)
		: (await verifyPassword(await dummyHash(), password), false);
	if (!row || !valid || !row.active) {
		await db.insert(signInFailure).values({ email, address });
		if (decision.delayMs > 0) await new Promise((r) => setTimeout(r, decision.delayMs));
		const after = await throttleFor(email, address);
		const slowed = decision.delayMs > 0 || !after.allowed;
		return {
			ok: false,
			message: slowed ? `${generic} Repeated failures slow sign-in down for this e-mail.` : generic
		};
	}
	await db.delete(signInFailure).where(eq(signInFailure.email, email));
	return { ok: true, userId: row.id, role: row.role };
}

async function throttleFor(email: string, address: string): Promise<ThrottleDecision> {
	const since = sql`now() - make_interval(mins => ${throttleWindowMinutes})`;
	const [counts] = await db
		.select({
			email: sql<number>`count(*) filter (where ${signInFailure.email} = ${email})::int`,
			address: sql<number>`count(*) filter (where ${signInFailure.address} = ${address})::int`,
			oldestEmail: sql<
				string | null
			>`min(${signInFailure.at}) filter (where ${signInFailure.email} = ${email})`,
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
			address: counts?.address ?? 0,
			oldestEmailFailure: counts?.oldestEmail ? new Date(counts.oldestEmail) : null,
			oldestAddressFailure: counts?.oldestAddress ? new Date(counts.oldestAddress) : null
		},
		new Date()
	);
}
