import { error, json } from '@sveltejs/kit';
import { queueAfterSchema } from '$lib/schemas/floor';
import { requireRole } from '$lib/server/auth';
import { floorBoard } from '$lib/server/floor/board';
import type { RequestHandler } from './$types';

/**
 * The bay board and a page of the out-of-spec queue, refreshed by the Floor when the log moves;
 * `?queueAfter=<seq>` gives the page after the item with that seq.
 */
export const GET: RequestHandler = async ({ url }) => {
	const user = requireRole('foreman', 'owner');
	const after = queueAfterSchema.safeParse(url.searchParams.get('queueAfter') ?? undefined);
	if (!after.success) error(400, 'queueAfter must be the seq of a queue item (a whole number).');
	return json(await floorBoard(user.shopId, after.data));
};
