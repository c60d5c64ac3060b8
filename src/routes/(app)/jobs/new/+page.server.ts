import { redirect } from '@sveltejs/kit';
import { intakeFromForm, intakeSchema } from '$lib/schemas/job';
import { echoValues } from '$lib/schemas/form';
import { requireRole } from '$lib/server/auth';
import { refuse } from '$lib/server/http';
import { readForm } from '$lib/server/request';
import { createJobCard, findCustomers, listBays, listTechnicians } from '$lib/server/job-cards';
import { listProcedures } from '$lib/server/procedures';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('service_writer', 'owner');
	const find = (url.searchParams.get('find') ?? '').trim().slice(0, 120);
	const [matches, procedures, technicians, bays] = await Promise.all([
		findCustomers(user.shopId, find),
		listProcedures(user.shopId),
		listTechnicians(user.shopId),
		listBays(user.shopId)
	]);
	return { find, matches, procedures, technicians, bays };
};

export const actions = {
	default: async ({ request }) => {
		const user = requireRole('service_writer', 'owner');
		const form = await readForm(request);
		const values = echoValues(form);
		const procedureIds = form.getAll('procedureIds').map(String);
		const parsed = intakeSchema.safeParse(intakeFromForm(form));
		if (!parsed.success) {
			return refuse(parsed.error, { values, procedureIds });
		}
		const result = await createJobCard(user.shopId, user.id, parsed.data);
		if (!result.ok) return refuse(result, { values, procedureIds });
		redirect(303, `/jobs/${result.number}?opened=1`);
	}
} satisfies Actions;
