import { activeStates } from '$lib/jobs/states';
import { requireRole } from '$lib/server/auth';
import { listJobs } from '$lib/server/jobs';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const user = requireRole('foreman', 'owner');
	return { jobs: await listJobs(user.shopId, { states: [...activeStates] }), now: new Date() };
};
