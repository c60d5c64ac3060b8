// The Floor's bay board: every active job with its progress, and the first page of the queue.
import { activeStates } from '$lib/jobs/states';
import { listJobs } from '../jobs';
import { queuePage } from './queue';

export type BoardJob = Awaited<ReturnType<typeof listJobs>>[number] & { openOutOfSpec: number };

/**
 * Every active job with its progress and open out-of-spec count, and the first page of the
 * queue (`queueAfter`: the seq of the last item of the page before).
 */
export async function floorBoard(shopId: string, queueAfter?: number) {
	const [jobs, queue] = await Promise.all([
		listJobs(shopId, { states: [...activeStates] }),
		queuePage(shopId, queueAfter)
	]);
	const board: BoardJob[] = jobs
		.map((j) => ({ ...j, openOutOfSpec: j.waiting }))
		.sort((a, b) => (a.bay ?? '~').localeCompare(b.bay ?? '~') || a.number - b.number);
	return { board, ...queue };
}
