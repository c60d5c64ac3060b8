import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth';
import { listStaff } from '$lib/server/staff';
import type { RequestHandler } from './$types';

/** The shop's staff accounts (owner only). */
export const GET: RequestHandler = async () => {
	const user = requireRole('owner');
	return json({ staff: await listStaff(user.shopId) });
};
