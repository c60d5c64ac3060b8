// The Jobs list's filtering, sorting and paging in SQL, so a shop with years of job cards pays
// for one page, not for every card. Same rules as the in-memory reference `jobPage`
// ($lib/jobs/table.ts), which the db test compares it with.
import type { JobPage } from '$lib/jobs/table';
import type { JobTableQuery } from '$lib/schemas/job';
import { db } from './db';
import { listJobs, type JobSummary } from './jobs';
import { jobSearchCountSql, jobSearchPageSql } from './jobs-sql';

/** One page of a shop's job cards with the filters, sort and page of the query string. */
export async function searchJobs(
	shopId: string,
	query: JobTableQuery
): Promise<JobPage & { rows: JobSummary[] }> {
	const [{ n }] = await db.execute(jobSearchCountSql(shopId, query));
	const total = Number(n);
	const pageCount = Math.max(1, Math.ceil(total / query.size));
	// Past the last page (e.g. after narrowing the filter): show the last one.
	const page = Math.min(query.page, pageCount);
	const ids = await db.execute(jobSearchPageSql(shopId, query, page));
	const list = await listJobs(shopId, { ids: ids.map((r) => r.id as string) });
	const byId = new Map(list.map((j) => [j.id, j]));
	const rows = ids.map((r) => byId.get(r.id as string)).filter((j) => j !== undefined);
	return { rows, total, page, pageCount };
}
