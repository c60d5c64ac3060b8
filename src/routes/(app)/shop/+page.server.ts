import { fail } from '@sveltejs/kit';
import {
	staffCreateSchema,
	staffIdSchema,
	staffPasswordSchema,
	staffRoleSchema
} from '$lib/schemas/auth';
import { echoValues, fieldErrors, formError } from '$lib/schemas/form';
import { requireRole } from '$lib/server/auth';
import { readForm } from '$lib/server/request';
import * as staff from '$lib/server/staff';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const user = requireRole('owner');
	return { staff: await staff.listStaff(user.shopId), me: user.id };
};

export const actions = {
	create: async ({ request }) => {
		const user = requireRole('owner');
		const form = await readForm(request);
		const values = echoValues(form);
		const parsed = staffCreateSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success)
			return fail(400, { action: 'create', values, errors: fieldErrors(parsed.error) });
		const result = await staff.createStaff(user.shopId, parsed.data);
		if (!result.ok) {
			return fail(400, {
				action: 'create',
				values,
				errors: formError(result.message, result.field)
			});
		}
		return { action: 'create', done: `Account for ${parsed.data.name} created.` };
	},
	role: async ({ request }) => {
		const user = requireRole('owner');
		const parsed = staffRoleSchema.safeParse(Object.fromEntries(await readForm(request)));
		if (!parsed.success) return fail(400, { action: 'role', errors: fieldErrors(parsed.error) });
		const result = await staff.setRole(user.shopId, parsed.data.userId, parsed.data.role);
		if (!result.ok) {
			return fail(result.status ?? 400, { action: 'role', errors: formError(result.message) });
		}
		return { action: 'role', done: 'Role changed.' };
	},
	deactivate: async ({ request }) => {
		const user = requireRole('owner');
		const parsed = staffIdSchema.safeParse(Object.fromEntries(await readForm(request)));
		if (!parsed.success)
			return fail(400, { action: 'deactivate', errors: fieldErrors(parsed.error) });
		const result = await staff.setActive(user.shopId, parsed.data.userId, false);
		if (!result.ok) {
			return fail(result.status ?? 400, {
				action: 'deactivate',
				errors: formError(result.message)
			});
		}
		return { action: 'deactivate', done: 'Account deactivated; its sessions have ended.' };
	},
	reactivate: async ({ request }) => {
		const user = requireRole('owner');
		const parsed = staffIdSchema.safeParse(Object.fromEntries(await readForm(request)));
		if (!parsed.success)
			return fail(400, { action: 'reactivate', errors: fieldErrors(parsed.error) });
		const result = await staff.setActive(user.shopId, parsed.data.userId, true);
		if (!result.ok) {
			return fail(result.status ?? 400, {
				action: 'reactivate',
				errors: formError(result.message)
			});
		}
		return { action: 'reactivate', done: 'Account active again.' };
	},
	password: async ({ request }) => {
		const user = requireRole('owner');
		const parsed = staffPasswordSchema.safeParse(Object.fromEntries(await readForm(request)));
		if (!parsed.success)
			return fail(400, { action: 'password', errors: fieldErrors(parsed.error) });
		const result = await staff.resetPassword(user.shopId, parsed.data.userId, parsed.data.password);
		if (!result.ok) {
			return fail(result.status ?? 400, { action: 'password', errors: formError(result.message) });
		}
		return { action: 'password', done: 'New password set; the account was signed out everywhere.' };
	}
} satisfies Actions;
