import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth';
import { sendToFinalInspection } from '$lib/server/bench/hand-over';
import { orError } from '$lib/server/http';
import { readBody } from '$lib/server/request';
import { finalInspectionSchema } from '$lib/schemas/bench';
import type { RequestHandler } from './$types';

/** Sends the job from in work to final inspection (a reason when steps are still open). */
export const POST: RequestHandler = async ({ params, request }) => {
	const user = requireRole('technician', 'foreman', 'owner');
	const body = await readBody(
		request,
		finalInspectionSchema,
		'The body must be JSON: { reason? }.'
	);
	const moved = orError(await sendToFinalInspection(user, params.jobId, body.reason));
	return json({ state: moved.state });
};
