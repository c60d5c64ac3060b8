import { requireRole } from '$lib/server/auth';
import { getInspection, requireJobId, signOffBlockers } from '$lib/server/floor';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const user = requireRole('foreman', 'owner');
	const state = await getInspection(user.shopId, requireJobId(params.jobId));
	return { state, blockers: signOffBlockers(state) };
};
