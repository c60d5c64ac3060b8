import { error } from '@sveltejs/kit';
import { isUuid } from '$lib/ids';
import { requireRole } from '$lib/server/auth';
import { getCustomer } from '$lib/server/vehicles';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const user = requireRole('service_writer', 'foreman', 'owner');
	const found = isUuid(params.id) ? await getCustomer(user.shopId, params.id) : null;
	if (!found) error(404, 'No such customer in this shop.');
	return found;
};
