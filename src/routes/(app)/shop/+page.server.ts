import {
	staffCreateSchema,
	staffIdSchema,
	staffPasswordSchema,
	staffRoleSchema
} from '$lib/schemas/auth';
import { echoValues } from '$lib/schemas/form';
import { requireRole } from '$lib/server/auth';
import { refuse } from '$lib/server/http';
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
		if (!parsed.success) return refuse(parsed.error, { action: 'create', values });
		const result = await staff.createStaff(user.shopId, parsed.data);
		if (!result.ok) return refuse(result, { action: 'create', values });
		return { action: 'create', done: `Account for ${parsed.data.name} created.` };
	},
	role: async ({ request }) => {
		const user = requireRole('owner');
		const parsed = staffRoleSchema.safeParse(Object.fromEntries(await readForm(request)));
		if (!parsed.success) return refuse(parsed.error, { action: 'role' });
		const result = await staff.setRole(user.shopId, parsed.data.userId, parsed.data.role);
		if (!result.ok) return refuse(result, { action: 'role' });
		return { action: 'role', done: 'Role changed.' };
	},
	deactivate: async ({ request }) => {
		const user = requireRole('owner');
		const parsed = staffIdSchema.safeParse(Object.fromEntries(await readForm(request)));
		if (!parsed.success) return refuse(parsed.error, { action: 'deactivate' });
		const result = await staff.setActive(user.shopId, parsed.data.userId, false);
		if (!result.ok) return refuse(result, { action: 'deactivate' });
		return { action: 'deactivate', done: 'Account deactivated; its sessions have ended.' };
	},
	reactivate: async ({ request }) => {
		const user = requireRole('owner');
		const parsed = staffIdSchema.safeParse(Object.fromEntries(await readForm(request)));
		if (!parsed.success) return refuse(parsed.error, { action: 'reactivate' });
		const result = await staff.setActive(user.shopId, parsed.data.userId, true);
		if (!result.ok) return refuse(result, { action: 'reactivate' });
		return { action: 'reactivate', done: 'Account active again.' };
	},
	password: async ({ request }) => {
		const user = requireRole('owner');
		const parsed = staffPasswordSchema.safeParse(Object.fromEntries(await readForm(request)));
		if (!parsed.success) return refuse(parsed.error, { action: 'password' });
		const result = await staff.resetPassword(user.shopId, parsed.data.userId, parsed.data.password);
		if (!result.ok) return refuse(result, { action: 'password' });
		return { action: 'password', done: 'New password set; the account was signed out everywhere.' };
	}
} satisfies Actions;
