import { error } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth';
import { getJob } from '$lib/server/entries';
import { subscribe } from '$lib/server/live';
import type { RequestHandler } from './$types';

const heartbeatMs = 15_000;

/**
 * Server-Sent Events for one job's log: a `change` event (with the entry's seq) whenever an
 * entry of this job is committed, or `resync` when events may have been missed. The Bench then
 * catches up through GET /entries?after=…, which stays the one source of truth.
 */
export const GET: RequestHandler = async ({ params }) => {
	const user = requireUser();
	const job = await getJob(user.shopId, params.jobId);
	if (!job) error(404, 'No such job.');
	const encoder = new TextEncoder();
	let cleanup = () => {};
	const stream = new ReadableStream<Uint8Array>({
		start(controller) {
			let open = true;
			const write = (text: string) => {
				if (!open) return;
				try {
					controller.enqueue(encoder.encode(text));
				} catch {
					close();
				}
			};
			const unsubscribe = subscribe(
				user.shopId,
				(e) => {
					if (e.jobId === job.id)
						write(`event: change\ndata: ${JSON.stringify({ seq: e.seq })}\n\n`);
				},
				() => write('event: resync\ndata: {}\n\n')
			);
			const heartbeat = setInterval(() => write(': keep-alive\n\n'), heartbeatMs);
			function close() {
				if (!open) return;
				open = false;
				unsubscribe();
				clearInterval(heartbeat);
				try {
					controller.close();
				} catch {
					// closed by the client already
				}
			}
			cleanup = close;
			write('retry: 2000\n\nevent: ready\ndata: {}\n\n');
		},
		cancel() {
			cleanup();
		}
	});
	return new Response(stream, {
		headers: {
			'content-type': 'text/event-stream; charset=utf-8',
			'cache-control': 'no-cache, no-transform',
			'x-accel-buffering': 'no'
		}
	});
};
