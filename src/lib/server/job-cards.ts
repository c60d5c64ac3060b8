// Job cards: intake (customer, vehicle, procedures copied onto the job), assignment, the
// job card page and extra work with the customer's approval. Scoped by shop id throughout.
import { and, asc, eq, ilike, inArray, isNull, or, sql } from 'drizzle-orm';
import type { IntakeInput } from '$lib/schemas/job';
import { failure, type Failure, type Result } from '$lib/result';
import { db, type Tx } from './db';
import { specFields } from './db/spec-fields';
import {
	customer,
	job,
	jobApproval,
	jobProcedure,
	jobStateChange,
	jobStep,
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
): Promise<Result> {
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
		return failure('not_found', 'A chosen procedure is not in the library (or is archived).');
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
		if (!t) return failure('invalid', 'Pick an active technician of this shop.', 'technicianId');
	}
	if (bay) {
		const [s] = await tx.select({ bays: shop.bays }).from(shop).where(eq(shop.id, shopId));
		if (!s?.bays.includes(bay)) return failure('invalid', 'Pick one of the shop’s bays.', 'bay');
	}
	return null;
}

export type IntakeResult = Result<{ number: number; jobId: string }>;

/** Thrown inside a transaction to roll it back and answer the refusal it carries. */
class Refused extends Error {
	constructor(readonly refusal: Failure) {
		super(refusal.message);
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
				if (!v?.customerId)
					throw new Refused(failure('not_found', 'That vehicle is not in this shop.', 'pick'));
				vehicleId = v.id;
				customerId = v.customerId;
			} else if (input.pick.startsWith('c:')) {
				const [c] = await tx
					.select({ id: customer.id })
					.from(customer)
					.where(and(eq(customer.shopId, shopId), eq(customer.id, input.pick.slice(2))));
				if (!c)
					throw new Refused(failure('not_found', 'That customer is not in this shop.', 'pick'));
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
			if (bad) throw new Refused(bad);

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
			if (!copied.ok) throw new Refused({ ...copied, field: 'procedureIds' });
			return { ok: true as const, number: row.number, jobId: row.id };
		});
	} catch (e) {
		if (e instanceof Refused) return e.refusal;
		throw e;
	}
}

export async function assignJob(
	shopId: string,
	jobId: string,
	input: { technicianId: string; bay: string }
): Promise<Result> {
	return db.transaction(async (tx) => {
		const bad = await checkAssignment(tx, shopId, input.technicianId, input.bay);
		if (bad) return bad;
		const rows = await tx
			.update(job)
			.set({ technicianId: input.technicianId || null, bay: input.bay || null })
			.where(and(eq(job.shopId, shopId), eq(job.id, jobId)))
			.returning({ id: job.id });
		return rows.length ? { ok: true } : failure('not_found', 'No such job card in this shop.');
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
): Promise<Result> {
	try {
		return await db.transaction(async (tx) => {
			const [j] = await tx
				.select({ id: job.id, state: job.state })
				.from(job)
				.where(and(eq(job.shopId, shopId), eq(job.id, jobId)))
				.for('update');
			if (!j) throw new Refused(failure('not_found', 'No such job card in this shop.'));
			if (!['open', 'in_work', 'on_hold', 'final_inspection'].includes(j.state)) {
				throw new Refused(
					failure('conflict', 'Work can be added only before the job is ready to invoice.')
				);
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
			if (!copied.ok) throw new Refused(copied);
			return { ok: true as const };
		});
	} catch (e) {
		if (e instanceof Refused) return e.refusal;
		throw e;
	}
}
