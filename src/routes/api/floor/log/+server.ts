import { json } from '@sveltejs/kit';
import { normalizeFilter } from '$lib/floor/log';
import { logPageSchema } from '$lib/schemas/floor';
import { requireRole } from '$lib/server/auth';
import { listLog } from '$lib/server/floor/log';
import { valid } from '$lib/server/request';
import type { RequestHandler } from './$types';

/** A page of the running log, newest first, older than `before` (keyset pagination). */
export const GET: RequestHandler = async ({ url }) => {
	const user = requireRole('foreman', 'owner');
	const { before, ...filter } = valid(logPageSchema, Object.fromEntries(url.searchParams));
	return json(await listLog(user.shopId, normalizeFilter(filter), before));
};
