import { normalizeFilter } from '$lib/floor/log';
import { logFilterSchema } from '$lib/schemas/floor';
import { requireRole } from '$lib/server/auth';
import { floorBoard } from '$lib/server/floor/board';
import { filterOptions, latestSeq, listLog } from '$lib/server/floor/log';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('foreman', 'owner');
	const parsed = logFilterSchema.safeParse(Object.fromEntries(url.searchParams));
	// A hand-edited query string with a bad value shows everything and says so.
	const filter = parsed.success ? normalizeFilter(parsed.data) : {};
	// Taken first: the stream resumes from here, so nothing logged during this load is missed.
	const streamFrom = await latestSeq(user.shopId);
	const [log, board, options] = await Promise.all([
		listLog(user.shopId, filter),
		floorBoard(user.shopId),
		filterOptions(user.shopId)
	]);
	return {
		log,
		filter,
		filterProblem: parsed.success ? null : (parsed.error.issues[0]?.message ?? 'Bad filter.'),
		...board,
		options,
		streamFrom,
		now: new Date().toISOString()
	};
};
