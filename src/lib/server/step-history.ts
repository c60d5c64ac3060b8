// "history <step>" from the Bench's call bar: the step's past readings on the job's vehicle,
// read from the same per-vehicle series as the vehicle page (vehicles.ts, stepSeries), so the
// two never disagree. Scoped by shop id; logs nothing.
import { and, eq } from 'drizzle-orm';
import type { StepHistoryView } from '$lib/bench/types';
import type { Verdict } from '$lib/phrase';
import { isUuid } from '$lib/ids';
import { db } from './db';
import * as s from './db/schema';
import { stepSeries } from './vehicles';

/** Readings shown on the Bench; the vehicle page has the whole series. */
export const HISTORY_LIMIT = 10;

/**
 * The step's measured values on the job's vehicle across its jobs, newest first (retracted ones
 * left out). Steps of other jobs are the same step when label and unit match, as on the vehicle
 * page. Null when the job or the step is not this shop's (callers answer 404).
 */
export async function stepHistory(
	shopId: string,
	jobId: string,
	jobStepId: string,
	limit = HISTORY_LIMIT
): Promise<StepHistoryView | null> {
	if (!isUuid(jobId) || !isUuid(jobStepId)) return null;
	const [row] = await db
		.select({
			label: s.jobStep.label,
			unit: s.jobStep.unit,
			vehicleId: s.job.vehicleId,
			jobNumber: s.job.number,
			registration: s.vehicle.registration
		})
		.from(s.jobStep)
		.innerJoin(s.job, and(eq(s.job.id, s.jobStep.jobId), eq(s.job.shopId, s.jobStep.shopId)))
		.leftJoin(s.vehicle, and(eq(s.vehicle.id, s.job.vehicleId), eq(s.vehicle.shopId, shopId)))
		.where(
			and(eq(s.jobStep.shopId, shopId), eq(s.jobStep.jobId, jobId), eq(s.jobStep.id, jobStepId))
		);
	if (!row) return null;
	const view: StepHistoryView = {
		stepLabel: row.label,
		unit: row.unit,
		registration: row.registration ?? null,
		readings: [],
		total: 0
	};
	if (!row.vehicleId || !row.unit) return view;
	const series = (await stepSeries(shopId, row.vehicleId, row.label)).find(
		(g) => g.unit === row.unit
	);
	if (!series) return view;
	const points = series.points.toReversed();
	view.total = points.length;
	view.readings = points.slice(0, limit).map((p) => ({
		entryId: p.entryId,
		jobNumber: p.jobNumber,
		thisJob: p.jobNumber === row.jobNumber,
		occurredAt: p.on.toISOString(),
		value: p.value,
		verdict: p.verdict as Verdict | null
	}));
	return view;
}
