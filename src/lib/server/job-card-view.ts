// The job card page's data: the job with its customer, vehicle, procedures, approvals, photos
// and each step's latest live entry. Scoped by shop id.
import { and, asc, desc, eq, sql } from 'drizzle-orm';
import { db } from './db';
import { isLive, isRetracted } from './log/live';
import {
	customer,
	job,
	jobApproval,
	jobProcedure,
	jobStep,
	part,
	user,
	vehicle
} from './db/schema';

/** Everything the job card page shows. */
export async function getJobCard(shopId: string, number: number) {
	const [row] = await db
		.select({
			job,
			customer,
			vehicle,
			technicianName: user.name
		})
		.from(job)
		.leftJoin(customer, and(eq(customer.shopId, job.shopId), eq(customer.id, job.customerId)))
		.leftJoin(vehicle, and(eq(vehicle.shopId, job.shopId), eq(vehicle.id, job.vehicleId)))
		.leftJoin(user, eq(user.id, job.technicianId))
		.where(and(eq(job.shopId, shopId), eq(job.number, number)))
		.limit(1);
	if (!row) return null;
	const jobId = row.job.id;
	const procedures = await db
		.select()
		.from(jobProcedure)
		.where(and(eq(jobProcedure.shopId, shopId), eq(jobProcedure.jobId, jobId)))
		.orderBy(asc(jobProcedure.position));
	const steps = await db
		.select({ step: jobStep, partCode: part.code, partDescription: part.description })
		.from(jobStep)
		.leftJoin(part, and(eq(part.shopId, jobStep.shopId), eq(part.id, jobStep.partId)))
		.where(and(eq(jobStep.shopId, shopId), eq(jobStep.jobId, jobId)))
		.orderBy(asc(jobStep.position));
	// A step's state: its latest live entry (not retracted, not itself a retraction).
	const latest = await db.execute(sql`
		select distinct on (e.job_step_id) e.job_step_id, e.kind, e.verdict, e.spec_value, e.spec_unit,
			e.occurred_at
		from log_entry e
		where e.shop_id = ${shopId} and e.job_id = ${jobId} and e.job_step_id is not null
		  and e.kind in ('measure', 'done', 'part')
		  and ${isLive('e')}
		order by e.job_step_id, e.seq desc
	`);
	const log = await db.execute(sql`
		select e.id, e.seq, e.kind, e.raw_text, e.source, e.value, e.unit, e.spec_value, e.spec_unit,
			e.verdict, e.note, e.occurred_at, e.retracts, u.name as author, s.label as step_label,
			${isRetracted('e')} as retracted
		from log_entry e
		join "user" u on u.id = e.author_id
		left join job_step s on s.id = e.job_step_id and s.shop_id = e.shop_id
		where e.shop_id = ${shopId} and e.job_id = ${jobId}
		order by e.seq desc
		limit 500
	`);
	const approvals = await db
		.select({
			id: jobApproval.id,
			description: jobApproval.description,
			approvedBy: jobApproval.approvedBy,
			channel: jobApproval.channel,
			approvedAt: jobApproval.approvedAt,
			recordedByName: user.name,
			createdAt: jobApproval.createdAt
		})
		.from(jobApproval)
		.leftJoin(user, eq(user.id, jobApproval.recordedBy))
		.where(and(eq(jobApproval.shopId, shopId), eq(jobApproval.jobId, jobId)))
		.orderBy(desc(jobApproval.createdAt));
	const byStep = new Map(latest.map((l) => [l.job_step_id as string, l]));
	return {
		job: row.job,
		customer: row.customer,
		vehicle: row.vehicle,
		technicianName: row.technicianName,
		procedures: procedures.map((p) => ({
			...p,
			steps: steps
				.filter((s) => s.step.jobProcedureId === p.id)
				.map(({ step, partCode, partDescription }) => {
					const l = byStep.get(step.id);
					return {
						...step,
						partCode,
						partDescription,
						done: Boolean(l),
						lastKind: (l?.kind as string | undefined) ?? null,
						lastVerdict: (l?.verdict as string | null | undefined) ?? null,
						lastValue: (l?.spec_value as number | null | undefined) ?? null
					};
				})
		})),
		log: log.map((e) => ({
			id: e.id as string,
			kind: e.kind as string,
			rawText: e.raw_text as string,
			source: e.source as string,
			value: e.value as number | null,
			unit: e.unit as string | null,
			specValue: e.spec_value as number | null,
			specUnit: e.spec_unit as string | null,
			verdict: e.verdict as 'in' | 'low' | 'high' | 'no_spec' | null,
			note: e.note as string | null,
			occurredAt: new Date(e.occurred_at as string),
			retracts: e.retracts as string | null,
			retracted: Boolean(e.retracted),
			author: e.author as string,
			stepLabel: e.step_label as string | null
		})),
		approvals
	};
}
export type JobCard = NonNullable<Awaited<ReturnType<typeof getJobCard>>>;
