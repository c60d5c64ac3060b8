// The Bench's job: who works on it, who may write on it, and the jobs a technician picks from.
// All SQL is scoped by shop id; another shop's job reads as "no such job".
import { and, eq, sql } from 'drizzle-orm';
import type { Role } from '$lib/auth/roles';
import { isUuid } from '$lib/ids';
import type { JobState } from '$lib/jobs/states';
import { db } from '../db';
import * as s from '../db/schema';

export interface Actor {
	id: string;
	shopId: string;
	role: Role;
	name?: string;
}

export interface BenchJob {
	id: string;
	number: number;
	state: JobState;
	technicianId: string | null;
	technicianName: string | null;
	bay: string | null;
	concern: string;
	vehicle: string | null;
	registration: string | null;
	customerName: string | null;
}

export const NOT_FOUND = 'No such job.';

/** A job with its technician, vehicle and customer, in the shape of `BenchJob` (toBenchJob). */
const jobSelect = sql`
	select j.id, j.number, j.state, j.technician_id, t.name as technician_name, j.bay, j.concern,
		nullif(trim(coalesce(v.make, '') || ' ' || coalesce(v.model, '')), '') as vehicle,
		v.registration, c.name as customer_name
	from job j
	left join "user" t on t.id = j.technician_id and t.shop_id = j.shop_id
	left join vehicle v on v.id = j.vehicle_id and v.shop_id = j.shop_id
	left join customer c on c.id = j.customer_id and c.shop_id = j.shop_id
`;

/** The job when it belongs to the shop; null otherwise (callers answer 404). */
export async function getJob(shopId: string, jobId: string): Promise<BenchJob | null> {
	if (!isUuid(jobId)) return null;
	const rows = await db.execute(sql`${jobSelect}
		where j.shop_id = ${shopId} and j.id = ${jobId}
	`);
	return rows[0] ? toBenchJob(rows[0]) : null;
}

function toBenchJob(r: Record<string, unknown>): BenchJob {
	return {
		id: r.id as string,
		number: r.number as number,
		state: r.state as JobState,
		technicianId: r.technician_id as string | null,
		technicianName: r.technician_name as string | null,
		bay: r.bay as string | null,
		concern: r.concern as string,
		vehicle: r.vehicle as string | null,
		registration: r.registration as string | null,
		customerName: r.customer_name as string | null
	};
}

/** The job by its card number ("job 1042" in the call bar). */
export async function findJobIdByNumber(shopId: string, number: number): Promise<string | null> {
	if (!Number.isInteger(number) || number < 1 || number > 2_147_483_647) return null;
	const [row] = await db
		.select({ id: s.job.id })
		.from(s.job)
		.where(and(eq(s.job.shopId, shopId), eq(s.job.number, number)))
		.limit(1);
	return row?.id ?? null;
}

/** Technicians write only on jobs assigned to them; foreman and owner on any job of the shop. */
export function mayWrite(actor: Actor, job: Pick<BenchJob, 'technicianId'>): boolean {
	if (actor.role === 'foreman' || actor.role === 'owner') return true;
	return actor.role === 'technician' && job.technicianId === actor.id;
}

/** Open jobs for the Bench's picker: a technician's own, or every active one for a foreman. */
export async function benchJobs(actor: Actor): Promise<BenchJob[]> {
	const mine = actor.role === 'technician' ? sql`and j.technician_id = ${actor.id}` : sql``;
	const rows = await db.execute(sql`${jobSelect}
		where j.shop_id = ${actor.shopId} and j.state in ('open', 'in_work', 'final_inspection', 'on_hold')
		${mine}
		order by (j.state = 'in_work') desc, j.number desc
	`);
	return rows.map(toBenchJob);
}
