import { activeStates } from '$lib/jobs/states';
import { requireRole } from '$lib/server/auth';
import { listJobs } from '$lib/server/jobs';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const user = requireRole('technician', 'foreman', 'owner');
	const jobs = await listJobs(user.shopId, {
		technicianId: user.role === 'technician' ? user.id : undefined,
		states: [...activeStates]
	});
	return { jobs, mine: user.role === 'technician' };
};
