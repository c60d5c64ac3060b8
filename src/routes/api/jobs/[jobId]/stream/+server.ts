import { error } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth';
import { getJob } from '$lib/server/bench/job';
import { subscribe } from '$lib/server/live';
import { eventStream } from '$lib/server/sse';
import type { RequestHandler } from './$types';

/**
 * Server-Sent Events for one job's log: a `change` event (with the entry's seq) whenever an
 * entry of this job is committed, or `resync` when events may have been missed. The Bench then
 * catches up through GET /entries?after=…, which stays the one source of truth.
 */
export const GET: RequestHandler = async ({ params }) => {
	const user = requireUser();
	const job = await getJob(user.shopId, params.jobId);
	if (!job) error(404, 'No such job.');
	return eventStream((sink) => {
		const unsubscribe = subscribe(
			user.shopId,
			(e) => {
				if (e.jobId === job.id)
					sink.write(`event: change\ndata: ${JSON.stringify({ seq: e.seq })}\n\n`);
			},
			() => sink.write('event: resync\ndata: {}\n\n'),
			// On SIGTERM end the stream, or adapter-node waits for every open Bench before it stops.
			() => sink.close()
		);
		sink.write('retry: 2000\n\nevent: ready\ndata: {}\n\n');
		return unsubscribe;
	});
};
