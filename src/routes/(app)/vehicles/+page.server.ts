import { vehicleSearchSchema } from '$lib/schemas/vehicle';
import { requireRole } from '$lib/server/auth';
import { searchVehicles } from '$lib/server/vehicles';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('service_writer', 'foreman', 'owner');
	const { q } = vehicleSearchSchema.parse({ q: url.searchParams.get('q') ?? '' });
	return { q, vehicles: await searchVehicles(user.shopId, q) };
};
