import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth';
import { getInspection, markReadyToInvoice, requireJobId } from '$lib/server/floor';
import type { RequestHandler } from './$types';

/** Moves a signed-off job to "ready to invoice"; refused without sign-off or with open items. */
export const POST: RequestHandler = async ({ params }) => {
	const user = requireRole('foreman', 'owner');
	const jobId = requireJobId(params.jobId);
	await markReadyToInvoice(user, jobId);
	return json(await getInspection(user.shopId, jobId));
};
