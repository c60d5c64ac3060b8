import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth';
import { floorBoard } from '$lib/server/floor';
import type { RequestHandler } from './$types';

/** The bay board and the out-of-spec queue, refreshed by the Floor when the log moves. */
export const GET: RequestHandler = async () => {
	const user = requireRole('foreman', 'owner');
	return json(await floorBoard(user.shopId));
};
