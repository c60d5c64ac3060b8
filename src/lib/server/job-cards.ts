// Job cards: intake (customer, vehicle, procedures copied onto the job), assignment, the
// job card page and extra work with the customer's approval. Scoped by shop id throughout.
import { and, asc, desc, eq, ilike, inArray, isNull, or, sql } from 'drizzle-orm';
import type { IntakeInput } from '$lib/schemas/job';
import { db, type Tx } from './db';
import { isLive, isRetracted } from './log/live';
import { specFields } from './db/spec-fields';
import {
	customer,
	job,
	jobApproval,
	jobProcedure,
	jobStateChange,
	jobStep,
	part,
	procedure,
	procedureStep,
	shop,
	user,
	vehicle
} from './db/schema';

export async function listTechnicians(shopId: string) {
	return db
		.select({ id: user.id, name: user.name })
		.from(user)
		.where(and(eq(user.shopId, shopId), eq(user.role, 'technician'), eq(user.active, true)))
		.orderBy(asc(user.name));
}

export async function listBays(shopId: string): Promise<string[]> {
	const [row] = await db.select({ bays: shop.bays }).from(shop).where(eq(shop.id, shopId));
	return row?.bays ?? [];
}

export interface IntakeMatch {
	customerId: string;
	customerName: string;
	phone: string | null;
	email: string | null;
	vehicles: {
		id: string;
		registration: string;
		make: string;
		model: string;
		year: number | null;
	}[];
}

/** Customers matching a name, phone, e-mail or registration, with their vehicles. */
export async function findCustomers(shopId: string, q: string): Promise<IntakeMatch[]> {
	const term = q.trim();
	if (!term) return [];
	const like = `%${term.replace(/[\\%_]/g, (m) => '\\' + m)}%`;
	const reg = `%${term.replace(/[\s-]+/g, '').replace(/[\\%_]/g, (m) => '\\' + m)}%`;
	const customers = await db
		.selectDistinct({
			id: customer.id,
			name: customer.name,
			phone: customer.phone,
			email: customer.email
		})
		.from(customer)
		.leftJoin(vehicle, and(eq(vehicle.customerId, customer.id), eq(vehicle.shopId, shopId)))
		.where(
			and(
				eq(customer.shopId, shopId),
				or(
					ilike(customer.name, like),
					ilike(customer.phone, like),
					ilike(customer.email, like),
					sql`replace(replace(${vehicle.registration}, ' ', ''), '-', '') ilike ${reg}`
				)
			)
		)
		.orderBy(asc(customer.name))
		.limit(10);
	if (!customers.length) return [];
	const vehicles = await db
		.select()
		.from(vehicle)
		.where(
			and(
				eq(vehicle.shopId, shopId),
				inArray(
					vehicle.customerId,
					customers.map((c) => c.id)
				)
			)
		)
		.orderBy(asc(vehicle.registration));
	return customers.map((c) => ({
		customerId: c.id,
		customerName: c.name,
		phone: c.phone,
		email: c.email,
		vehicles: vehicles
			.filter((v) => v.customerId === c.id)
			.map((v) => ({
				id: v.id,
				registration: v.registration,
				make: v.make,
				model: v.model,
				year: v.year
			}))
	}));
}

/**
 * Copies procedures onto a job: one job_procedure each and its steps as job_steps, so later
 * edits of the library never change this job. Archived procedures are not attached.
 */
export async function copyProcedures(
	tx: Tx,
	shopId: string,
	jobId: string,
	procedureIds: string[]
): Promise<{ ok: true } | { ok: false; message: string }> {
	if (!procedureIds.length) return { ok: true };
	const procs = await tx
		.select()
		.from(procedure)
		.where(
			and(
				eq(procedure.shopId, shopId),
				inArray(procedure.id, procedureIds),
				isNull(procedure.archivedAt)
			)
		);
	if (procs.length !== new Set(procedureIds).size) {
		return { ok: false, message: 'A chosen procedure is not in the library (or is archived).' };
	}
	const [{ next }] = await tx
		.select({ next: sql<number>`coalesce(max(${jobProcedure.position}), 0)::int` })
		.from(jobProcedure)
		.where(eq(jobProcedure.jobId, jobId));
	const [{ nextStep }] = await tx
		.select({ nextStep: sql<number>`coalesce(max(${jobStep.position}), 0)::int` })
		.from(jobStep)
		.where(eq(jobStep.jobId, jobId));
	let position = next;
	let stepPosition = nextStep;
	for (const id of procedureIds) {
		const p = procs.find((x) => x.id === id)!;
		const [jp] = await tx
			.insert(jobProcedure)
			.values({
				shopId,
				jobId,
				procedureId: p.id,
				name: p.name,
				flatRateHours: p.flatRateHours,
				position: ++position
			})
			.returning({ id: jobProcedure.id });
		const steps = await tx
			.select()
			.from(procedureStep)
			.where(and(eq(procedureStep.shopId, shopId), eq(procedureStep.procedureId, p.id)))
			.orderBy(asc(procedureStep.position));
		if (steps.length) {
			await tx.insert(jobStep).values(
				steps.map((s) => ({
					shopId,
					jobId,
					jobProcedureId: jp.id,
					procedureStepId: s.id,
					position: ++stepPosition,
					...specFields(s)
				}))
			);
		}
	}
	return { ok: true };
}

async function checkAssignment(tx: Tx, shopId: string, technicianId: string, bay: string) {
	if (technicianId) {
		const [t] = await tx
			.select({ id: user.id })
			.from(user)
			.where(
				and(
					eq(user.shopId, shopId),
					eq(user.id, technicianId),
					eq(user.role, 'technician'),
					eq(user.active, true)
				)
			);
		if (!t) return { field: 'technicianId', message: 'Pick an active technician of this shop.' };
	}
	if (bay) {
		const [s] = await tx.select({ bays: shop.bays }).from(shop).where(eq(shop.id, shopId));
		if (!s?.bays.includes(bay)) return { field: 'bay', message: 'Pick one of the shop’s bays.' };
	}
	return null;
}

export type IntakeResult =
	{ ok: true; number: number; jobId: string } | { ok: false; field?: string; message: string };

class Refused extends Error {
	constructor(
		message: string,
		readonly field?: string
	) {
		super(message);
	}
}

/**
 * Opens a job card. The job number is the shop's next one, taken under a per-shop advisory
 * lock so two desks opening cards at once never get the same number.
 */
export async function createJobCard(
	shopId: string,
	byUserId: string,
	input: IntakeInput
): Promise<IntakeResult> {
	try {
		return await db.transaction(async (tx) => {
			let customerId: string;
			let vehicleId: string | null = null;
			if (input.pick.startsWith('v:')) {
				const [v] = await tx
					.select({ id: vehicle.id, customerId: vehicle.customerId })
					.from(vehicle)
					.where(and(eq(vehicle.shopId, shopId), eq(vehicle.id, input.pick.slice(2))));
				if (!v?.customerId) throw new Refused('That vehicle is not in this shop.', 'pick');
				vehicleId = v.id;
				customerId = v.customerId;
			} else if (input.pick.startsWith('c:')) {
				const [c] = await tx
					.select({ id: customer.id })
					.from(customer)
					.where(and(eq(customer.shopId, shopId), eq(customer.id, input.pick.slice(2))));
				if (!c) throw new Refused('That customer is not in this shop.', 'pick');
				customerId = c.id;
			} else {
				const [c] = await tx
					.insert(customer)
					.values({
						shopId,
						name: input.customerName,
						phone: input.customerPhone,
						email: input.customerEmail
					})
					.returning({ id: customer.id });
				customerId = c.id;
			}
			if (!vehicleId) {
				const [v] = await tx
					.insert(vehicle)
					.values({
						shopId,
						customerId,
						registration: input.registration,
						frameNumber: input.frameNumber,
						make: input.make,
						model: input.model,
						year: input.year,
						colour: input.colour
					})
					.returning({ id: vehicle.id });
				vehicleId = v.id;
			}
			const bad = await checkAssignment(tx, shopId, input.technicianId, input.bay);
			if (bad) throw new Refused(bad.message, bad.field);

			await tx.execute(
				sql`select pg_advisory_xact_lock(hashtextextended(${'job-number:' + shopId}, 0))`
			);
			const [{ next }] = await tx
				.select({ next: sql<number>`coalesce(max(${job.number}), 0)::int + 1` })
				.from(job)
				.where(eq(job.shopId, shopId));
			const [row] = await tx
				.insert(job)
				.values({
					shopId,
					number: next,
					customerId,
					vehicleId,
					odometer: input.odometer,
					odometerUnit: input.odometerUnit,
					fuelLevel: input.fuelLevel,
					damageNotes: input.damageNotes,
					concern: input.concern,
					requestedWork: input.requestedWork,
					promisedAt: input.promisedAt,
					technicianId: input.technicianId || null,
					bay: input.bay || null,
					createdBy: byUserId
				})
				.returning({ id: job.id, number: job.number });
			await tx
				.insert(jobStateChange)
				.values({ shopId, jobId: row.id, fromState: null, toState: 'open', byUserId });
			const copied = await copyProcedures(tx, shopId, row.id, input.procedureIds);
			if (!copied.ok) throw new Refused(copied.message, 'procedureIds');
			return { ok: true as const, number: row.number, jobId: row.id };
		});
	} catch (e) {
		if (e instanceof Refused) return { ok: false, field: e.field, message: e.message };
		throw e;
	}
}

export async function assignJob(
	shopId: string,
	jobId: string,
	input: { technicianId: string; bay: string }
): Promise<{ ok: true } | { ok: false; field?: string; message: string }> {
	return db.transaction(async (tx) => {
		const bad = await checkAssignment(tx, shopId, input.technicianId, input.bay);
		if (bad) return { ok: false, ...bad };
		const rows = await tx
			.update(job)
			.set({ technicianId: input.technicianId || null, bay: input.bay || null })
			.where(and(eq(job.shopId, shopId), eq(job.id, jobId)))
			.returning({ id: job.id });
		return rows.length ? { ok: true } : { ok: false, message: 'No such job card in this shop.' };
	});
}

/**
 * Extra work found during a job: the customer's approval is written first, then the
 * procedure's steps are copied, in one transaction.
 */
export async function addExtraWork(
	shopId: string,
	byUserId: string,
	jobId: string,
	input: {
		procedureId: string;
		description: string;
		approvedBy: string;
		channel: string;
		approvedAt: Date;
	}
): Promise<{ ok: true } | { ok: false; message: string }> {
	try {
		return await db.transaction(async (tx) => {
			const [j] = await tx
				.select({ id: job.id, state: job.state })
				.from(job)
				.where(and(eq(job.shopId, shopId), eq(job.id, jobId)))
				.for('update');
			if (!j) throw new Refused('No such job card in this shop.');
			if (!['open', 'in_work', 'on_hold', 'final_inspection'].includes(j.state)) {
				throw new Refused('Work can be added only before the job is ready to invoice.');
			}
			await tx.insert(jobApproval).values({
				shopId,
				jobId,
				description: input.description,
				approvedBy: input.approvedBy,
				channel: input.channel,
				approvedAt: input.approvedAt,
				recordedBy: byUserId
			});
			const copied = await copyProcedures(tx, shopId, jobId, [input.procedureId]);
			if (!copied.ok) throw new Refused(copied.message);
			return { ok: true as const };
		});
	} catch (e) {
		if (e instanceof Refused) return { ok: false, message: e.message };
		throw e;
	}
}

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
		.leftJoin(customer, eq(customer.id, job.customerId))
		.leftJoin(vehicle, eq(vehicle.id, job.vehicleId))
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
		.leftJoin(part, eq(part.id, jobStep.partId))
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
		left join job_step s on s.id = e.job_step_id
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
