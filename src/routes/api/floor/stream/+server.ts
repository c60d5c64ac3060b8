import { json } from '@sveltejs/kit';
import type { FloorEntry } from '$lib/floor/log';
import { streamAfterSchema } from '$lib/schemas/floor';
import { requireRole } from '$lib/server/auth';
import { entriesByIds, entriesSince, latestSeq } from '$lib/server/floor';
import { subscribe } from '$lib/server/live';
import { eventStream } from '$lib/server/sse';
import type { RequestHandler } from './$types';

const rememberIds = 5_000;

/**
 * The running log, live (Server-Sent Events). Each event's `id:` is the highest seq sent so
 * far, so the browser's automatic reconnect (Last-Event-ID) or `?after=` resumes there: the
 * server first catches up from the database (re-scanning a short window for transactions that
 * committed late), then streams what the live hub announces. Repeats are dropped here by id and
 * again in the browser.
 */
export const GET: RequestHandler = async ({ request, url }) => {
	const user = requireRole('foreman', 'owner');
	const raw = request.headers.get('last-event-id') ?? url.searchParams.get('after');
	let after: number | null = null;
	if (raw !== null && raw !== '') {
		const parsed = streamAfterSchema.safeParse(raw);
		if (!parsed.success) {
			return json({ message: 'after must be a whole number: the last seq seen.' }, { status: 400 });
		}
		after = parsed.data;
	}
	const shopId = user.shopId;
	return eventStream((sink) => {
		const { write, close } = sink;
		let highSeq = 0;
		const sent = new Set<string>();
		let chain: Promise<void> = Promise.resolve();

		const send = (entries: FloorEntry[]) => {
			for (const e of entries) {
				if (sent.has(e.id)) continue;
				sent.add(e.id);
				if (sent.size > rememberIds) sent.delete(sent.values().next().value as string);
				highSeq = Math.max(highSeq, e.seq);
				write(`id: ${highSeq}\nevent: entry\ndata: ${JSON.stringify(e)}\n\n`);
			}
		};
		const run = (task: () => Promise<void>) => {
			chain = chain.then(task).catch((err) => {
				console.error('floor stream: a step failed', err);
				// Let the browser reconnect and catch up rather than leave a gap.
				close();
			});
		};
		const catchUp = async () => {
			for (;;) {
				const batch = await entriesSince(shopId, highSeq);
				const before = highSeq;
				send(batch);
				if (batch.length < 500 || highSeq === before) break;
			}
		};
		const unsubscribe = subscribe(
			shopId,
			(e) => run(async () => send(await entriesByIds(shopId, [e.id]))),
			() => run(catchUp),
			() => close()
		);
		write('retry: 2000\n\n');
		run(async () => {
			if (after === null) {
				highSeq = await latestSeq(shopId);
			} else {
				highSeq = after;
				await catchUp();
			}
			write(`event: ready\ndata: ${JSON.stringify({ seq: highSeq })}\n\n`);
		});
		return unsubscribe;
	});
};
