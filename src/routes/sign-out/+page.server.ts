import { redirect } from '@sveltejs/kit';
import { lucia } from '$lib/server/auth';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = () => {
	redirect(303, '/');
};

export const actions = {
	default: async ({ locals, cookies }) => {
		if (locals.session) await lucia.invalidateSession(locals.session.id);
		const blank = lucia.createBlankSessionCookie();
		cookies.set(blank.name, blank.value, { path: '.', ...blank.attributes });
		redirect(303, '/sign-in');
	}
} satisfies Actions;
