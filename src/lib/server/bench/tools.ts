// The shop's torque tools for the Bench, with their calibration state, and the shop's
// tolerance and calibration interval.
import { and, eq } from 'drizzle-orm';
import type { ToolView } from '$lib/bench/types';
import { calibrationDue } from '$lib/torque';
import { db } from '../db';
import * as s from '../db/schema';
import { lastChecks } from '../tool-checks';

// a torque tool as the Bench offers it: the type the page shares
export type { ToolView };

export async function shopTolerance(shopId: string): Promise<{ pct: number; months: number }> {
	const [row] = await db
		.select({ pct: s.shop.defaultTolerancePct, months: s.shop.calibrationMonths })
		.from(s.shop)
		.where(eq(s.shop.id, shopId));
	return { pct: row?.pct ?? 10, months: row?.months ?? 12 };
}

function toolStatus(
	calibratedOn: string | null,
	months: number,
	today: Date
): { dueDate: string | null; state: ToolView['state'] } {
	// A tool never calibrated is treated as overdue: nothing vouches for its readings.
	if (!calibratedOn) return { dueDate: null, state: 'overdue' };
	try {
		const st = calibrationDue(calibratedOn, { months, today });
		return { dueDate: st.dueDate, state: st.state };
	} catch {
		return { dueDate: null, state: 'overdue' };
	}
}

/** The shop's active torque tools with their calibration state. */
export async function listTools(shopId: string, today = new Date()): Promise<ToolView[]> {
	const { months } = await shopTolerance(shopId);
	const checks = await lastChecks(shopId);
	const rows = await db
		.select()
		.from(s.torqueTool)
		.where(and(eq(s.torqueTool.shopId, shopId), eq(s.torqueTool.active, true)))
		.orderBy(s.torqueTool.identifier);
	return rows.map((t) => ({
		id: t.id,
		identifier: t.identifier,
		kind: t.kind,
		rangeMin: t.rangeMin,
		rangeMax: t.rangeMax,
		unit: t.unit,
		effectiveLengthMm: t.effectiveLengthMm,
		...failedOr(checks.get(t.id), toolStatus(t.calibratedOn, t.intervalMonths ?? months, today))
	}));
}

/** A failed last check marks the tool as an overdue calibration does (ISO 6789-2). */
function failedOr(
	last: { checkedOn: string; passed: boolean } | undefined,
	status: { dueDate: string | null; state: ToolView['state'] }
): Pick<ToolView, 'dueDate' | 'state' | 'checkFailed'> {
	if (last && !last.passed) return { ...status, state: 'overdue', checkFailed: last.checkedOn };
	return { ...status, checkFailed: null };
}
