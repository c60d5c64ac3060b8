// Shop settings and torque tools. Scoped by shop id.
import { failure, type Result } from '$lib/result';
import { and, asc, eq } from 'drizzle-orm';
import { db } from './db';
import { isUniqueViolation } from './db/errors';
import { shop, torqueTool } from './db/schema';

export async function updateSettings(
	shopId: string,
	input: {
		currency: string;
		labourRateMinor: number;
		taxRateBp: number;
		defaultTolerancePct: number;
		idleGapMinutes: number;
		calibrationMonths: number;
		bays: string[];
		/** left as it is when not given */
		locale?: string;
		timeZone?: string;
	}
) {
	await db.update(shop).set(input).where(eq(shop.id, shopId));
}

export function listTools(shopId: string) {
	return db
		.select()
		.from(torqueTool)
		.where(eq(torqueTool.shopId, shopId))
		.orderBy(asc(torqueTool.identifier));
}

export async function saveTool(
	shopId: string,
	input: {
		toolId: string;
		identifier: string;
		kind: string;
		rangeMin: number;
		rangeMax: number;
		unit: string;
		calibratedOn: string;
		intervalMonths: number | null;
		effectiveLengthMm?: number | null;
	}
): Promise<Result> {
	const values = {
		identifier: input.identifier,
		kind: input.kind,
		rangeMin: input.rangeMin,
		rangeMax: input.rangeMax,
		unit: input.unit,
		calibratedOn: input.calibratedOn || null,
		intervalMonths: input.intervalMonths,
		effectiveLengthMm: input.effectiveLengthMm ?? null
	};
	try {
		if (input.toolId) {
			const rows = await db
				.update(torqueTool)
				.set(values)
				.where(and(eq(torqueTool.shopId, shopId), eq(torqueTool.id, input.toolId)))
				.returning({ id: torqueTool.id });
			if (!rows.length) return failure('not_found', 'No such tool in this shop.');
		} else {
			await db.insert(torqueTool).values({ shopId, ...values });
		}
		return { ok: true };
	} catch (e) {
		if (isUniqueViolation(e)) {
			return failure('conflict', `A tool named ${input.identifier} exists.`, 'identifier');
		}
		throw e;
	}
}
