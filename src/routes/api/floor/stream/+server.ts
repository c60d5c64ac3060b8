import type { FloorEntry } from '$lib/floor/log';
import { encodeResume, RESCAN_WINDOW, type ResumePoint } from '$lib/floor/resume';
import { streamAfterSchema } from '$lib/schemas/floor';
import { requireRole } from '$lib/server/auth';
import { announcedEntries, entriesSince, latestSeq } from '$lib/server/floor/log';
import { subscribe } from '$lib/server/live';
import { valid } from '$lib/server/request';
import { eventStream } from '$lib/server/sse';
import type { RequestHandler } from './$types';

const rememberIds = 5_000;

/**
 * The running log, live (Server-Sent Events). Each event's `id:` is where to resume
 * ($lib/floor/resume: the highest seq sent and which seqs of the re-scan window below it were
 * sent), so the browser's automatic reconnect (Last-Event-ID) or `?after=` resumes there: the
 * server first catches up from the database (re-scanning the window for transactions that
 * committed late, skipping what the browser already has), then streams what the live hub
 * announces. Repeats are dropped here by id, and again in the browser.
 */
export const GET: RequestHandler = async ({ request, url }) => {
	const user = requireRole('foreman', 'owner');
	const raw = request.headers.get('last-event-id') ?? url.searchParams.get('after');
	let after: ResumePoint | null = null;
	if (raw !== null && raw !== '') {
		after = valid(streamAfterSchema, raw);
	}
	const shopId = user.shopId;
	return eventStream((sink) => {
		const { write, close } = sink;
		let highSeq = 0;
		const sent = new Set<string>();
		// seqs of the re-scan window the browser has: from its resume point, then as sent
		const sentSeqs = new Set<number>(after?.sent ?? []);
		let chain: Promise<void> = Promise.resolve();

		const send = (entries: FloorEntry[]) => {
			for (const e of entries) {
				if (sent.has(e.id) || sentSeqs.has(e.seq)) continue;
				sent.add(e.id);
				if (sent.size > rememberIds) sent.delete(sent.values().next().value as string);
				sentSeqs.add(e.seq);
				highSeq = Math.max(highSeq, e.seq);
				if (sentSeqs.size > 2 * RESCAN_WINDOW) {
					for (const q of sentSeqs) if (q <= highSeq - RESCAN_WINDOW) sentSeqs.delete(q);
				}
				write(
					`id: ${encodeResume(highSeq, sentSeqs)}\nevent: entry\ndata: ${JSON.stringify(e)}\n\n`
				);
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
		// Entries announced while a read is in flight wait for the next one and go together, so a
		// busy floor costs one read at a time per stream, not one per entry (which fell behind).
		let announced: string[] = [];
		const unsubscribe = subscribe(
			shopId,
			(e) => {
				announced.push(e.id);
				if (announced.length > 1) return;
				run(async () => {
					const ids = announced;
					announced = [];
					send(await announcedEntries(shopId, ids));
				});
			},
			() => run(catchUp),
			() => close()
		);
		write('retry: 2000\n\n');
		run(async () => {
			if (after === null) {
				highSeq = await latestSeq(shopId);
			} else {
				highSeq = after.high;
				await catchUp();
			}
			write(`event: ready\ndata: ${JSON.stringify({ seq: highSeq })}\n\n`);
		});
		return unsubscribe;
	});
};
