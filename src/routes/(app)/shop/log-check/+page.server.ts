import { requireRole } from '$lib/server/auth';
import { verifyShopChains } from '$lib/server/evidence-for-job';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const user = requireRole('owner');
	const report = await verifyShopChains(user.shopId);
	return { report, checkedAt: new Date() };
};
