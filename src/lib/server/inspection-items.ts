// The shop's final-inspection checklist, edited by the owner on Shop settings. A removed line
// is marked inactive, never deleted: ticks on past jobs keep pointing at it and still show.
import { failure, type Result } from '$lib/result';
import { and, asc, eq, sql } from 'drizzle-orm';
import { db } from './db';
import { inspectionItem } from './db/schema';

const noSuchItem = failure('not_found', 'No such checklist item in this shop.');

const MAX_ITEMS = 40;

export function listInspectionItems(shopId: string) {
	return db
		.select({ id: inspectionItem.id, label: inspectionItem.label })
		.from(inspectionItem)
		.where(and(eq(inspectionItem.shopId, shopId), eq(inspectionItem.active, true)))
		.orderBy(asc(inspectionItem.position), asc(inspectionItem.createdAt));
}

function sameLabel(a: string, b: string) {
	return a.trim().toLowerCase() === b.trim().toLowerCase();
}

/** Adds a line at the end of the list, or renames one. Labels are unique within a shop's list. */
export async function saveInspectionItem(
	shopId: string,
	input: { itemId: string; label: string }
): Promise<Result> {
	return db.transaction(async (tx) => {
		// One writer at a time per shop, so two owners adding at once get distinct positions.
		await tx.execute(
			sql`select pg_advisory_xact_lock(hashtext('inspection_item'), hashtext(${shopId}))`
		);
		const current = await tx
			.select({
				id: inspectionItem.id,
				label: inspectionItem.label,
				position: inspectionItem.position
			})
			.from(inspectionItem)
			.where(and(eq(inspectionItem.shopId, shopId), eq(inspectionItem.active, true)));
		const clash = current.find((i) => i.id !== input.itemId && sameLabel(i.label, input.label));
		if (clash) {
			return failure('conflict', `"${clash.label}" is on the list already.`, 'label');
		}
		if (input.itemId) {
			if (!current.some((i) => i.id === input.itemId)) {
				return noSuchItem;
			}
			await tx
				.update(inspectionItem)
				.set({ label: input.label })
				.where(and(eq(inspectionItem.shopId, shopId), eq(inspectionItem.id, input.itemId)));
			return { ok: true };
		}
		if (current.length >= MAX_ITEMS) {
			return failure('conflict', `A checklist holds at most ${MAX_ITEMS} lines.`, 'label');
		}
		const last = Math.max(0, ...current.map((i) => i.position));
		await tx.insert(inspectionItem).values({ shopId, label: input.label, position: last + 1 });
		return { ok: true };
	});
}

/** Moves a line one place up or down, or takes it off the list (kept for past jobs' ticks). */
export async function changeInspectionItem(
	shopId: string,
	itemId: string,
	change: 'up' | 'down' | 'remove'
): Promise<Result> {
	return db.transaction(async (tx) => {
		await tx.execute(
			sql`select pg_advisory_xact_lock(hashtext('inspection_item'), hashtext(${shopId}))`
		);
		const list = await tx
			.select({ id: inspectionItem.id, position: inspectionItem.position })
			.from(inspectionItem)
			.where(and(eq(inspectionItem.shopId, shopId), eq(inspectionItem.active, true)))
			.orderBy(asc(inspectionItem.position), asc(inspectionItem.createdAt));
		const at = list.findIndex((i) => i.id === itemId);
		if (at < 0) return noSuchItem;
		if (change === 'remove') {
			await tx
				.update(inspectionItem)
				.set({ active: false })
				.where(and(eq(inspectionItem.shopId, shopId), eq(inspectionItem.id, itemId)));
			return { ok: true };
		}
		const to = change === 'up' ? at - 1 : at + 1;
		if (to < 0 || to >= list.length) return { ok: true }; // already first or last
		const order = list.map((i) => i.id);
		[order[at], order[to]] = [order[to], order[at]];
		// Renumber the whole list 1..n: old data with equal positions ends up in a clean order.
		for (const [index, id] of order.entries()) {
			await tx
				.update(inspectionItem)
				.set({ position: index + 1 })
				.where(and(eq(inspectionItem.shopId, shopId), eq(inspectionItem.id, id)));
		}
		return { ok: true };
	});
}
