import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth';
import { getInspection, requireJobId, signOff } from '$lib/server/floor';
import type { RequestHandler } from './$types';

/** Signs a job off after final inspection (foreman and owner only). */
export const POST: RequestHandler = async ({ params }) => {
	const user = requireRole('foreman', 'owner');
	const jobId = requireJobId(params.jobId);
	await signOff(user, jobId);
	return json(await getInspection(user.shopId, jobId));
};
