import { requireRole } from '$lib/server/auth';
import { jobPage } from '$lib/jobs/table';
import { jobTableQuerySchema } from '$lib/schemas/job';
import { listBays, listTechnicians } from '$lib/server/job-cards';
import { listJobs } from '$lib/server/jobs';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('service_writer', 'owner', 'foreman');
	// Bad values in the query string fall back to defaults: a hand-edited URL never fails.
	const query = jobTableQuerySchema.parse(Object.fromEntries(url.searchParams));
	const [jobs, technicians, bays] = await Promise.all([
		listJobs(user.shopId),
		listTechnicians(user.shopId),
		listBays(user.shopId)
	]);
	return {
		page: jobPage(jobs, query),
		query,
		technicians,
		bays,
		canOpen: user.role !== 'foreman'
	};
};
