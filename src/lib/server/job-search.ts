// The Jobs list's filtering, sorting and paging in SQL, so a shop with years of job cards pays
// for one page, not for every card. Same rules as the in-memory reference `jobPage`
// ($lib/jobs/table.ts), which the db test compares it with.
import { sql, type SQL } from 'drizzle-orm';
import type { JobPage } from '$lib/jobs/table';
import { activeStates } from '$lib/jobs/states';
import type { JobTableQuery } from '$lib/schemas/job';
import { db } from './db';
import { listJobs, type JobSummary } from './jobs';

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
		const prefix = `${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
		// Each arm can use an index: the job number, and trigram indexes on the customer's name
		// and the normalised registration (drizzle/0011).
		parts.push(sql`(j.number::text like ${prefix}
			or j.customer_id in (select id from customer
				where shop_id = ${shopId} and lower(name) like ${contains(q)})
			${
				reg
					? sql`or j.vehicle_id in (select id from vehicle where shop_id = ${shopId}
				and lower(regexp_replace(registration, '[\\s-]+', '', 'g')) like ${contains(reg)})`
					: sql``
			})`);
	}
	if (query.state === 'active') {
		parts.push(
			sql`j.state::text in (${sql.join(
				activeStates.map((s) => sql`${s}`),
				sql`, `
			)})`
		);
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
	left join customer c on c.id = j.customer_id
	left join vehicle v on v.id = j.vehicle_id
	left join "user" t on t.id = j.technician_id`;

/** One page of a shop's job cards with the filters, sort and page of the query string. */
export async function searchJobs(
	shopId: string,
	query: JobTableQuery
): Promise<JobPage & { rows: JobSummary[] }> {
	const where = whereSql(shopId, query);
	const [{ n }] = await db.execute(
		sql`select count(*)::int as n from job j ${joins} where ${where}`
	);
	const total = Number(n);
	const pageCount = Math.max(1, Math.ceil(total / query.size));
	// Past the last page (e.g. after narrowing the filter): show the last one.
	const page = Math.min(query.page, pageCount);
	const dir = query.dir === 'desc' ? sql`desc` : sql`asc`;
	const ids = await db.execute(sql`
		select j.id from job j ${joins} where ${where}
		order by ${sortSql[query.sort]} ${dir}, j.number desc
		limit ${query.size} offset ${(page - 1) * query.size}`);
	const list = await listJobs(shopId, { ids: ids.map((r) => r.id as string) });
	const byId = new Map(list.map((j) => [j.id, j]));
	const rows = ids.map((r) => byId.get(r.id as string)).filter((j) => j !== undefined);
	return { rows, total, page, pageCount };
}
