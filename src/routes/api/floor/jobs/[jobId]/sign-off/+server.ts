import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth';
import { getInspection, signOff, noSuchJob } from '$lib/server/floor/inspection';
import { found, orError, requireJobId } from '$lib/server/http';
import type { RequestHandler } from './$types';

/** Signs a job off after final inspection (foreman and owner only). */
export const POST: RequestHandler = async ({ params }) => {
	const user = requireRole('foreman', 'owner');
	const jobId = requireJobId(params.jobId);
	orError(await signOff(user, jobId));
	return json(found(await getInspection(user.shopId, jobId), noSuchJob));
};
