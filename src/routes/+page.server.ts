import { redirect } from '@sveltejs/kit';
import { homeFor } from '$lib/auth/roles';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => {
	redirect(303, locals.user ? homeFor(locals.user.role) : '/sign-in');
};
