import { requireRole } from '$lib/server/auth';
import { listJobs } from '$lib/server/jobs';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const user = requireRole('service_writer', 'owner', 'foreman');
	return { jobs: await listJobs(user.shopId) };
};
