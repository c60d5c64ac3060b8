import { requireRole } from '$lib/server/auth';
import { getInspection, noSuchJob, signOffBlockers } from '$lib/server/floor/inspection';
import { found, requireJobId } from '$lib/server/http';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const user = requireRole('foreman', 'owner');
	const state = found(await getInspection(user.shopId, requireJobId(params.jobId)), noSuchJob);
	return { state, blockers: signOffBlockers(state) };
};
