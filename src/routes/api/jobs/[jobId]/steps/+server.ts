import { error, json } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth';
import { getJob, listSteps } from '$lib/server/entries';
import type { RequestHandler } from './$types';

/** The job's steps with specs, done state and cautions. */
export const GET: RequestHandler = async ({ params }) => {
	const user = requireUser();
	const job = await getJob(user.shopId, params.jobId);
	if (!job) error(404, 'No such job.');
	return json({ job, steps: await listSteps(user.shopId, job.id) });
};
