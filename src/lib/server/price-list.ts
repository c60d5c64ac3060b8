// The shop's price list (parts, consumables, fluids). Scoped by shop id.
import { failure, type Result } from '$lib/result';
import { and, asc, eq } from 'drizzle-orm';
import { db } from './db';
import { isUniqueViolation } from './db/errors';
import { part } from './db/schema';

export function listParts(shopId: string, opts: { all?: boolean } = {}) {
	return db
		.select()
		.from(part)
		.where(and(eq(part.shopId, shopId), opts.all ? undefined : eq(part.active, true)))
		.orderBy(asc(part.code));
}

export async function savePart(
	shopId: string,
	input: {
		partId?: string;
		code: string;
		description: string;
		unit: 'each' | 'L' | 'mL';
		priceMinor: number;
		fluid?: string | null;
	}
): Promise<Result> {
	const values = {
		code: input.code,
		description: input.description,
		unit: input.unit,
		priceMinor: input.priceMinor,
		fluid: input.fluid ?? null
	};
	try {
		if (input.partId) {
			const rows = await db
				.update(part)
				.set(values)
				.where(and(eq(part.shopId, shopId), eq(part.id, input.partId)))
				.returning({ id: part.id });
			if (!rows.length) return failure('not_found', 'No such part in this shop.');
		} else {
			await db.insert(part).values({ shopId, ...values });
		}
		return { ok: true };
	} catch (e) {
		if (isUniqueViolation(e)) {
			return failure('conflict', `The code ${input.code} is already on the list.`, 'code');
		}
		throw e;
	}
}

export async function setPartActive(shopId: string, partId: string, active: boolean) {
	const rows = await db
		.update(part)
		.set({ active })
		.where(and(eq(part.shopId, shopId), eq(part.id, partId)))
		.returning({ id: part.id });
	return rows.length > 0;
}
