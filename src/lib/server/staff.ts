// Staff accounts of one shop. Every query is scoped by the caller's shop id.
import { and, asc, eq, ne } from 'drizzle-orm';
import type { Role } from '$lib/auth/roles';
import { failure, type Result } from '$lib/result';
import { forgetUser, lucia } from './auth';
import { db } from './db';
import { user } from './db/schema';
import { hashPassword } from './password';

export function listStaff(shopId: string) {
	return db
		.select({
			id: user.id,
			name: user.name,
			email: user.email,
			role: user.role,
			active: user.active
		})
		.from(user)
		.where(eq(user.shopId, shopId))
		.orderBy(asc(user.name));
}

const noSuchAccount = failure('not_found', 'No such account in this shop.');
const lastOwner = failure('conflict', 'The shop needs at least one active owner.');

export async function createStaff(
	shopId: string,
	input: { name: string; email: string; role: Role; password: string }
): Promise<Result> {
	const passwordHash = await hashPassword(input.password);
	const rows = await db
		.insert(user)
		.values({ shopId, name: input.name, email: input.email, role: input.role, passwordHash })
		.onConflictDoNothing({ target: user.email })
		.returning({ id: user.id });
	if (rows.length === 0) {
		// E-mail addresses sign in across every shop, so they are unique across shops; the answer
		// names a colleague already here, and says nothing of an account in another shop.
		const [here] = await db
			.select({ name: user.name })
			.from(user)
			.where(and(eq(user.shopId, shopId), eq(user.email, input.email)));
		return failure(
			'conflict',
			here
				? `${here.name} already signs in with that e-mail in this shop.`
				: 'That e-mail cannot be used for a new account. Use another address.',
			'email'
		);
	}
	return { ok: true };
}

/** Refuses to leave the shop without an active owner. */
async function wouldRemoveLastOwner(shopId: string, userId: string): Promise<boolean> {
	const owners = await db
		.select({ id: user.id })
		.from(user)
		.where(
			and(
				eq(user.shopId, shopId),
				eq(user.role, 'owner'),
				eq(user.active, true),
				ne(user.id, userId)
			)
		);
	return owners.length === 0;
}

async function findInShop(shopId: string, userId: string) {
	const [row] = await db
		.select()
		.from(user)
		.where(and(eq(user.shopId, shopId), eq(user.id, userId)))
		.limit(1);
	return row ?? null;
}

export async function setRole(shopId: string, userId: string, role: Role): Promise<Result> {
	const row = await findInShop(shopId, userId);
	if (!row) return noSuchAccount;
	if (row.role === 'owner' && role !== 'owner' && (await wouldRemoveLastOwner(shopId, userId))) {
		return lastOwner;
	}
	await db
		.update(user)
		.set({ role })
		.where(and(eq(user.shopId, shopId), eq(user.id, userId)));
	forgetUser(userId);
	return { ok: true };
}

/** Deactivating ends the account's sessions at once. */
export async function setActive(shopId: string, userId: string, active: boolean): Promise<Result> {
	const row = await findInShop(shopId, userId);
	if (!row) return noSuchAccount;
	if (!active && row.role === 'owner' && (await wouldRemoveLastOwner(shopId, userId))) {
		return lastOwner;
	}
	await db
		.update(user)
		.set({ active })
		.where(and(eq(user.shopId, shopId), eq(user.id, userId)));
	forgetUser(userId);
	if (!active) await lucia.invalidateUserSessions(userId);
	return { ok: true };
}

/** A new password ends the account's other sessions. */
export async function resetPassword(
	shopId: string,
	userId: string,
	password: string
): Promise<Result> {
	const row = await findInShop(shopId, userId);
	if (!row) return noSuchAccount;
	await db
		.update(user)
		.set({ passwordHash: await hashPassword(password) })
		.where(and(eq(user.shopId, shopId), eq(user.id, userId)));
	await lucia.invalidateUserSessions(userId);
	return { ok: true };
}
