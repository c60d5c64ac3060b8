import { error } from '@sveltejs/kit';
import { isUuid } from '$lib/ids';
import { echoValues } from '$lib/schemas/form';
import { reminderSchema } from '$lib/schemas/vehicle';
import { requireRole } from '$lib/server/auth';
import { refuse } from '$lib/server/http';
import { readForm } from '$lib/server/request';
import { getShop } from '$lib/server/shop';
import {
	getVehicle,
	outOfSpecHistory,
	sendDueReminder,
	stepSeries,
	vehicleDue,
	vehicleJobs,
	vehiclePhotos
} from '$lib/server/vehicles';
import { checkVin } from '$lib/vehicles/vin';
import type { Actions, PageServerLoad } from './$types';

async function vehicleOr404(shopId: string, id: string) {
	const v = isUuid(id) ? await getVehicle(shopId, id) : null;
	if (!v) error(404, 'No such vehicle in this shop.');
	return v;
}

export const load: PageServerLoad = async ({ params }) => {
	const user = requireRole('service_writer', 'foreman', 'owner');
	const vehicle = await vehicleOr404(user.shopId, params.id);
	const [jobs, steps, outOfSpec, photos, due] = await Promise.all([
		vehicleJobs(user.shopId, vehicle.id),
		stepSeries(user.shopId, vehicle.id),
		outOfSpecHistory(user.shopId, vehicle.id),
		vehiclePhotos(user.shopId, vehicle.id),
		vehicleDue(user.shopId, vehicle.id)
	]);
	return {
		vehicle,
		vinWarnings: vehicle.vin ? checkVin(vehicle.vin).warnings : [],
		jobs,
		steps,
		outOfSpec,
		photos,
		due,
		canRemind: user.role !== 'foreman'
	};
};

export const actions = {
	remind: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const vehicle = await vehicleOr404(user.shopId, params.id);
		const form = await readForm(request);
		const values = echoValues(form);
		const parsed = reminderSchema.safeParse(values);
		if (!parsed.success) return refuse(parsed.error, { values });
		const shop = (await getShop(user.shopId))!;
		const sent = await sendDueReminder(user.shopId, vehicle.id, parsed.data.to, user.id, shop.name);
		if (!sent.ok) return refuse(sent, { values });
		return { done: `Reminder sent to ${parsed.data.to}.` };
	}
} satisfies Actions;
