// SQL of the Jobs list and the bay board, kept free of SvelteKit imports so that
// scripts/bench-floor.ts measures exactly what the app runs.
import { sql, type SQL } from 'drizzle-orm';
import { activeStates, type JobState } from '../jobs/states';
import { stateArray } from './state-array';
import type { JobTableQuery } from '../schemas/job';

export interface JobListFilter {
	technicianId?: string;
	states?: JobState[];
	ids?: string[];
}

/** Jobs with their progress, read from the state kept at each append (drizzle/0011). */
export function listJobsSql(shopId: string, filter: JobListFilter) {
	const byTechnician = filter.technicianId
		? sql`and j.technician_id = ${filter.technicianId}`
		: sql``;
	const byState = !filter.states
		? sql``
		: filter.states.length === 0
			? sql`and false`
			: sql`and j.state = any(${stateArray(filter.states)}::job_state[])`;
	const byIds = !filter.ids
		? sql``
		: filter.ids.length === 0
			? sql`and false`
			: sql`and j.id in (${sql.join(
					filter.ids.map((id) => sql`${id}::uuid`),
					sql`, `
				)})`;
	return sql`
		select j.id, j.number, j.state, j.state_reason, j.bay, j.concern, j.created_at,
			j.technician_id, t.name as technician_name, c.name as customer_name,
			v.registration, nullif(trim(coalesce(v.make, '') || ' ' || coalesce(v.model, '')), '') as vehicle,
			(select count(*) from job_step s where s.job_id = j.id)::int as steps_total,
			coalesce(ss.done, 0)::int as steps_done,
			coalesce(ss.out_of_spec, 0)::int as out_of_spec,
			coalesce(ss.waiting, 0)::int as waiting,
			ls.last_entry_at
		from job j
		left join "user" t on t.id = j.technician_id
		left join customer c on c.id = j.customer_id and c.shop_id = j.shop_id
		left join vehicle v on v.id = j.vehicle_id and v.shop_id = j.shop_id
		left join job_log_state ls on ls.shop_id = j.shop_id and ls.job_id = j.id
		left join lateral (
			select count(*) filter (where x.done) as done,
				count(*) filter (where x.latest_verdict in ('low', 'high')) as out_of_spec,
				count(*) filter (where x.waiting) as waiting
			from job_step_state x where x.job_id = j.id and x.shop_id = j.shop_id
		) ss on true
		where j.shop_id = ${shopId}
		  ${byTechnician}
		  ${byState}
		  ${byIds}
		order by j.number desc
	`;
}

// ——— The Jobs list: search, filters, sort and paging ———

const sortSql: Record<JobTableQuery['sort'], SQL> = {
	number: sql`j.number`,
	customer: sql`coalesce(c.name, '')`,
	registration: sql`coalesce(v.registration, '')`,
	state: sql`j.state::text`,
	technician: sql`coalesce(t.name, '')`,
	bay: sql`coalesce(j.bay, '')`,
	created: sql`j.created_at`
};

/** `%…%` for LIKE, with the user's own %, _ and \ taken literally. */
function contains(text: string): string {
	return `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

function whereSql(shopId: string, query: JobTableQuery): SQL {
	const parts: SQL[] = [sql`j.shop_id = ${shopId}`];
	const q = query.q.trim().toLowerCase().replace(/^#/, '');
	if (q) {
		const reg = q.replace(/[\s-]+/g, '');
		// Each arm reads an index (drizzle/0011): the job number as text, and trigram indexes on
		// the customer's name and the normalised registration, then jobs by customer or vehicle.
		const arms: SQL[] = [];
		if (/^\d+$/.test(q)) {
			arms.push(sql`select id from job where shop_id = ${shopId} and number::text like ${`${q}%`}`);
		}
		arms.push(sql`select id from job where shop_id = ${shopId} and customer_id in (
			select id from customer where shop_id = ${shopId} and lower(name) like ${contains(q)})`);
		if (reg) {
			arms.push(sql`select id from job where shop_id = ${shopId} and vehicle_id in (
				select id from vehicle where shop_id = ${shopId}
				and lower(regexp_replace(registration, '[\\s-]+', '', 'g')) like ${contains(reg)})`);
		}
		parts.push(sql`j.id in (${sql.join(arms, sql` union `)})`);
	}
	if (query.state === 'active') {
		parts.push(sql`j.state = any(${stateArray(activeStates)}::job_state[])`);
	} else if (query.state) parts.push(sql`j.state = ${query.state}`);
	if (query.technician === 'none') parts.push(sql`j.technician_id is null`);
	else if (query.technician) parts.push(sql`j.technician_id = ${query.technician}`);
	if (query.bay) parts.push(sql`j.bay = ${query.bay}`);
	if (query.from) {
		parts.push(sql`j.created_at >= (${query.from}::date::timestamp at time zone 'UTC')`);
	}
	if (query.to) {
		parts.push(sql`j.created_at < ((${query.to}::date + 1)::timestamp at time zone 'UTC')`);
	}
	return sql.join(parts, sql` and `);
}

const joins = sql`
	left join customer c on c.id = j.customer_id and c.shop_id = j.shop_id
	left join vehicle v on v.id = j.vehicle_id and v.shop_id = j.shop_id
	left join "user" t on t.id = j.technician_id`;

/** How many job cards match the query (over all pages). */
export function jobSearchCountSql(shopId: string, query: JobTableQuery) {
	return sql`select count(*)::int as n from job j ${joins} where ${whereSql(shopId, query)}`;
}

/** The ids of one page of matching job cards, in the query's order. */
export function jobSearchPageSql(shopId: string, query: JobTableQuery, page: number) {
	const dir = query.dir === 'desc' ? sql`desc` : sql`asc`;
	return sql`
		select j.id from job j ${joins} where ${whereSql(shopId, query)}
		order by ${sortSql[query.sort]} ${dir}, j.number desc
		limit ${query.size} offset ${(page - 1) * query.size}`;
}
