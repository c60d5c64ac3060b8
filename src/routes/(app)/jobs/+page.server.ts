import { requireRole } from '$lib/server/auth';
import { jobTableQuerySchema } from '$lib/schemas/job';
import { listBays, listTechnicians } from '$lib/server/job-cards';
import { searchJobs } from '$lib/server/job-search';
import { vehiclesDueWithin } from '$lib/server/vehicles';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('service_writer', 'owner', 'foreman');
	// Bad values in the query string fall back to defaults: a hand-edited URL never fails.
	const query = jobTableQuerySchema.parse(Object.fromEntries(url.searchParams));
	// ?due=30: the vehicles with service due within 30 days (or overdue), above the job cards.
	const showDue = url.searchParams.get('due') === '30';
	const [page, technicians, bays, due] = await Promise.all([
		searchJobs(user.shopId, query),
		listTechnicians(user.shopId),
		listBays(user.shopId),
		showDue ? vehiclesDueWithin(user.shopId, 30) : null
	]);
	return {
		page,
		query,
		technicians,
		bays,
		due,
		canOpen: user.role !== 'foreman'
	};
};
