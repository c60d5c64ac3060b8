import { redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { procedureEditors, procedureReaders } from '$lib/procedures/access';
import { procedureFormSchema } from '$lib/schemas/procedure';
import { failure } from '$lib/result';
import { echoValues } from '$lib/schemas/form';
import { requireRole } from '$lib/server/auth';
import { refuse } from '$lib/server/http';
import { readForm } from '$lib/server/request';
import * as procedures from '$lib/server/procedures';
import type { Actions, PageServerLoad } from './$types';

const readers = procedureReaders;
const editors = procedureEditors;
const idSchema = z.object({ id: z.uuid('Unknown procedure.') });
const noSuchProcedure = failure('not_found', 'No such procedure.');

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole(...readers);
	const archived = url.searchParams.get('archived') === '1';
	return {
		procedures: await procedures.listProcedures(user.shopId, { archived }),
		archived,
		canEdit: editors.includes(user.role)
	};
};

export const actions = {
	create: async ({ request }) => {
		const user = requireRole(...editors);
		const form = await readForm(request);
		const parsed = procedureFormSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success) {
			return refuse(parsed.error, { action: 'create', values: echoValues(form) });
		}
		const id = await procedures.createProcedure(user.shopId, parsed.data);
		redirect(303, `/procedures/${id}`);
	},
	duplicate: async ({ request }) => {
		const user = requireRole(...editors);
		const parsed = idSchema.safeParse(Object.fromEntries(await readForm(request)));
		if (!parsed.success) return refuse(parsed.error, { action: 'duplicate' });
		const id = await procedures.duplicateProcedure(user.shopId, parsed.data.id);
		if (!id) return refuse(noSuchProcedure, { action: 'duplicate' });
		redirect(303, `/procedures/${id}?copied=1`);
	},
	archive: async ({ request }) => {
		const user = requireRole(...editors);
		const parsed = idSchema.safeParse(Object.fromEntries(await readForm(request)));
		if (!parsed.success) return refuse(parsed.error, { action: 'archive' });
		if (!(await procedures.setArchived(user.shopId, parsed.data.id, true))) {
			return refuse(noSuchProcedure, { action: 'archive' });
		}
		return { action: 'archive', done: 'Archived: it is no longer offered for new jobs.' };
	},
	restore: async ({ request }) => {
		const user = requireRole(...editors);
		const parsed = idSchema.safeParse(Object.fromEntries(await readForm(request)));
		if (!parsed.success) return refuse(parsed.error, { action: 'restore' });
		if (!(await procedures.setArchived(user.shopId, parsed.data.id, false))) {
			return refuse(noSuchProcedure, { action: 'restore' });
		}
		return { action: 'restore', done: 'Back in the library.' };
	}
} satisfies Actions;
