import { json } from '@sveltejs/kit';
import { inspectionTickSchema } from '$lib/schemas/floor';
import { requireRole } from '$lib/server/auth';
import { getInspection, noSuchJob, setInspectionTick } from '$lib/server/floor/inspection';
import { found, orError, requireJobId } from '$lib/server/http';
import { readBody } from '$lib/server/request';
import type { RequestHandler } from './$types';

/** The final-inspection checklist of a job, with who ticked what. */
export const GET: RequestHandler = async ({ params }) => {
	const user = requireRole('foreman', 'owner');
	const jobId = requireJobId(params.jobId);
	return json(found(await getInspection(user.shopId, jobId), noSuchJob));
};

/** Ticks or unticks a checklist item (foreman and owner only). */
export const POST: RequestHandler = async ({ params, request }) => {
	const user = requireRole('foreman', 'owner');
	const body = await readBody(
		request,
		inspectionTickSchema,
		'The body must be JSON: { itemId, ticked }.'
	);
	const jobId = requireJobId(params.jobId);
	orError(await setInspectionTick(user, jobId, body.itemId, body.ticked));
	return json(found(await getInspection(user.shopId, jobId), noSuchJob));
};
