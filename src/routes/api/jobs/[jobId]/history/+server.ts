import { error, json } from '@sveltejs/kit';
import { z } from 'zod';
import { requireRole } from '$lib/server/auth';
import { getJob } from '$lib/server/bench/job';
import { valid } from '$lib/server/request';
import { stepHistory } from '$lib/server/step-history';
import type { RequestHandler } from './$types';

const querySchema = z.object({
	step: z.uuid({ error: 'step must be the id of a step of this job: ?step=<id>.' })
});

/** "history <step>" on the Bench: the step's past readings on the job's vehicle; logs nothing. */
export const GET: RequestHandler = async ({ params, url }) => {
	const user = requireRole('technician', 'foreman', 'owner');
	const job = await getJob(user.shopId, params.jobId);
	if (!job) error(404, 'No such job.');
	const query = valid(querySchema, Object.fromEntries(url.searchParams));
	const view = await stepHistory(user.shopId, job.id, query.step);
	if (!view) error(404, 'No such step on this job.');
	return json(view);
};
