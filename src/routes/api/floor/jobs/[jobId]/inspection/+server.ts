import { json } from '@sveltejs/kit';
import { inspectionTickSchema } from '$lib/schemas/floor';
import { requireRole } from '$lib/server/auth';
import { getInspection, readJsonBody, requireJobId, setInspectionTick } from '$lib/server/floor';
import type { RequestHandler } from './$types';

/** The final-inspection checklist of a job, with who ticked what. */
export const GET: RequestHandler = async ({ params }) => {
	const user = requireRole('foreman', 'owner');
	return json(await getInspection(user.shopId, requireJobId(params.jobId)));
};

/** Ticks or unticks a checklist item (foreman and owner only). */
export const POST: RequestHandler = async ({ params, request }) => {
	const user = requireRole('foreman', 'owner');
	const body = inspectionTickSchema.safeParse(await readJsonBody(request));
	if (!body.success) {
		return json({ message: body.error.issues[0]?.message ?? 'Bad request.' }, { status: 400 });
	}
	const jobId = requireJobId(params.jobId);
	await setInspectionTick(user, jobId, body.data.itemId, body.data.ticked);
	return json(await getInspection(user.shopId, jobId));
};
