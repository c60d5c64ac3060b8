import { json } from '@sveltejs/kit';
import { inspectionTickSchema } from '$lib/schemas/floor';
import { requireRole } from '$lib/server/auth';
import { getInspection, noSuchJob, setInspectionTick } from '$lib/server/floor/inspection';
import { found, orError, requireJobId } from '$lib/server/http';
import { readJson } from '$lib/server/request';
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
	const body = inspectionTickSchema.safeParse(await readJson(request, 'Send a JSON body.'));
	if (!body.success) {
		return json({ message: body.error.issues[0]?.message ?? 'Bad request.' }, { status: 400 });
	}
	const jobId = requireJobId(params.jobId);
	orError(await setInspectionTick(user, jobId, body.data.itemId, body.data.ticked));
	return json(found(await getInspection(user.shopId, jobId), noSuchJob));
};
