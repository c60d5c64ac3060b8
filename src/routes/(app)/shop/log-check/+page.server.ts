import { requireRole } from '$lib/server/auth';
import { client } from '$lib/server/db';
import { verifyChains } from '$lib/server/chain-verify';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const user = requireRole('owner');
	const report = await verifyChains(client, user.shopId);
	return { report, checkedAt: new Date() };
};
