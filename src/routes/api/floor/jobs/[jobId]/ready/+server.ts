import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth';
import { getInspection, markReadyToInvoice, noSuchJob } from '$lib/server/floor/inspection';
import { found, orError, requireJobId } from '$lib/server/http';
import type { RequestHandler } from './$types';

/** Moves a signed-off job to "ready to invoice"; refused without sign-off or with open items. */
export const POST: RequestHandler = async ({ params }) => {
	const user = requireRole('foreman', 'owner');
	const jobId = requireJobId(params.jobId);
	orError(await markReadyToInvoice(user, jobId));
	return json(found(await getInspection(user.shopId, jobId), noSuchJob));
};
