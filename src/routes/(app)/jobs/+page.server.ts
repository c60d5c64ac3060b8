import { requireRole } from '$lib/server/auth';
import { jobTableQuerySchema } from '$lib/schemas/job';
import { listBays, listTechnicians } from '$lib/server/job-cards';
import { searchJobs } from '$lib/server/job-search';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('service_writer', 'owner', 'foreman');
	// Bad values in the query string fall back to defaults: a hand-edited URL never fails.
	const query = jobTableQuerySchema.parse(Object.fromEntries(url.searchParams));
	const [page, technicians, bays] = await Promise.all([
		searchJobs(user.shopId, query),
		listTechnicians(user.shopId),
		listBays(user.shopId)
	]);
	return {
		page,
		query,
		technicians,
		bays,
		canOpen: user.role !== 'foreman'
	};
};
