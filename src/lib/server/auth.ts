import { dev } from '$app/environment';
import { env } from '$env/dynamic/private';
import { getRequestEvent } from '$app/server';
import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import { error, redirect } from '@sveltejs/kit';
import { and, eq, gt, sql } from 'drizzle-orm';
import { Lucia, TimeSpan } from 'lucia';
import type { Role } from '$lib/auth/roles';
import { decide, throttleWindowMinutes, type ThrottleDecision } from '$lib/auth/throttle';
import { db } from './db';
import { session, signInFailure, user } from './db/schema';
import { dummyHash, verifyPassword } from './password';

const adapter = new DrizzlePostgreSQLAdapter(db, session, user);

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
