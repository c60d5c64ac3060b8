import { json } from '@sveltejs/kit';
import { normalizeFilter } from '$lib/floor/log';
import { logPageSchema } from '$lib/schemas/floor';
import { requireRole } from '$lib/server/auth';
import { listLog } from '$lib/server/floor/log';
import type { RequestHandler } from './$types';

/** A page of the running log, newest first, older than `before` (keyset pagination). */
export const GET: RequestHandler = async ({ url }) => {
	const user = requireRole('foreman', 'owner');
	const parsed = logPageSchema.safeParse(Object.fromEntries(url.searchParams));
	if (!parsed.success) {
		return json({ message: parsed.error.issues[0]?.message ?? 'Bad filter.' }, { status: 400 });
	}
	const { before, ...filter } = parsed.data;
	return json(await listLog(user.shopId, normalizeFilter(filter), before));
};
