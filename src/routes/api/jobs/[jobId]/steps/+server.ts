import { error, json } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth';
import { getJob } from '$lib/server/bench/job';
import { listSteps } from '$lib/server/bench/steps';
import { listOpenRedos } from '$lib/server/floor/queue';
import type { RequestHandler } from './$types';

/** The job's steps with specs, done state and cautions, and the foreman's open redo orders. */
export const GET: RequestHandler = async ({ params }) => {
	const user = requireUser();
	const job = await getJob(user.shopId, params.jobId);
	if (!job) error(404, 'No such job.');
	const [steps, redos] = await Promise.all([
		listSteps(user.shopId, job.id),
		listOpenRedos(user.shopId, job.id)
	]);
	return json({ job, steps, redos });
};
