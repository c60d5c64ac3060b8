import { navFor } from '$lib/auth/roles';
import { requireUser } from '$lib/server/auth';
import { getShop } from '$lib/server/shop';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async () => {
	const user = requireUser();
	const shop = await getShop(user.shopId);
	return {
		user,
		shop: { name: shop?.name ?? '' },
		/** read by currentFormat() ($lib/format/page.svelte) on every page of the app */
		shopStyle: { locale: shop?.locale ?? 'en-GB', timeZone: shop?.timeZone ?? 'UTC' },
		nav: navFor(user.role).map(({ href, label }) => ({ href, label }))
	};
};
