// Job cards of one shop, with their progress. Every query is scoped by shop id.
import { sql } from 'drizzle-orm';
import type { JobState } from '$lib/jobs/states';
import { db } from './db';

export interface JobSummary {
	id: string;
	number: number;
	state: JobState;
	stateReason: string | null;
	bay: string | null;
	concern: string;
	createdAt: Date;
	technicianId: string | null;
	technicianName: string | null;
	customerName: string | null;
	registration: string | null;
	vehicle: string | null;
	stepsTotal: number;
	stepsDone: number;
	outOfSpec: number;
	lastEntryAt: Date | null;
}

/**
 * Jobs with progress: a step is done once it has an entry that is not retracted; the
 * out-of-spec count is of steps whose latest measurement (not retracted) is under or over.
 */
export async function listJobs(
	shopId: string,
	filter: { technicianId?: string; states?: JobState[] } = {}
): Promise<JobSummary[]> {
	const byTechnician = filter.technicianId
		? sql`and j.technician_id = ${filter.technicianId}`
		: sql``;
	const byState = !filter.states
		? sql``
		: filter.states.length === 0
			? sql`and false`
			: sql`and j.state::text in (${sql.join(
					filter.states.map((state) => sql`${state}`),
					sql`, `
				)})`;
	const rows = await db.execute(sql`
		with live as (
			select e.* from log_entry e
			where e.shop_id = ${shopId}
			  and e.kind <> 'retraction'
			  and not exists (select 1 from log_entry r where r.retracts = e.id and r.shop_id = ${shopId})
		),
		latest as (
			select distinct on (job_step_id) job_step_id, verdict
			from live where kind = 'measure' and job_step_id is not null
			order by job_step_id, seq desc
		)
		select j.id, j.number, j.state, j.state_reason, j.bay, j.concern, j.created_at,
			j.technician_id, t.name as technician_name, c.name as customer_name,
			v.registration, nullif(trim(coalesce(v.make, '') || ' ' || coalesce(v.model, '')), '') as vehicle,
			(select count(*) from job_step s where s.job_id = j.id)::int as steps_total,
			(select count(distinct l.job_step_id) from live l where l.job_id = j.id
				and l.kind in ('measure', 'done', 'part'))::int as steps_done,
			(select count(*) from job_step s join latest on latest.job_step_id = s.id
				where s.job_id = j.id and latest.verdict in ('low', 'high'))::int as out_of_spec,
			(select max(l.occurred_at) from live l where l.job_id = j.id) as last_entry_at
		from job j
		left join "user" t on t.id = j.technician_id
		left join customer c on c.id = j.customer_id
		left join vehicle v on v.id = j.vehicle_id
		where j.shop_id = ${shopId}
		  ${byTechnician}
		  ${byState}
		order by j.number desc
	`);
	return rows.map((r) => ({
		id: r.id as string,
		number: r.number as number,
		state: r.state as JobState,
		stateReason: r.state_reason as string | null,
		bay: r.bay as string | null,
		concern: r.concern as string,
		createdAt: new Date(r.created_at as string),
		technicianId: r.technician_id as string | null,
		technicianName: r.technician_name as string | null,
		customerName: r.customer_name as string | null,
		registration: r.registration as string | null,
		vehicle: r.vehicle as string | null,
		stepsTotal: r.steps_total as number,
		stepsDone: r.steps_done as number,
		outOfSpec: r.out_of_spec as number,
		lastEntryAt: r.last_entry_at ? new Date(r.last_entry_at as string) : null
	}));
}
