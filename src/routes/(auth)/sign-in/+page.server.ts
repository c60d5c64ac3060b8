import { redirect } from '@sveltejs/kit';
import { landingFor } from '$lib/auth/roles';
import { signInSchema } from '$lib/schemas/auth';
import { echoValues } from '$lib/schemas/form';
import { checkSignIn, lucia } from '$lib/server/auth';
import { refuse } from '$lib/server/http';
import { readForm } from '$lib/server/request';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals, url }) => {
	if (locals.user) redirect(303, landingFor(locals.user.role, url.searchParams.get('next')));
};

export const actions = {
	default: async ({ request, cookies, url, getClientAddress, locals }) => {
		const form = await readForm(request);
		const values = echoValues(form);
		const parsed = signInSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success) return refuse(parsed.error, { values });

		const result = await checkSignIn(parsed.data.email, parsed.data.password, getClientAddress());
		if (!result.ok) return refuse(result, { values });
		// A fresh session on every sign-in: an old cookie is never promoted (no fixation).
		if (locals.session) await lucia.invalidateSession(locals.session.id);
		const session = await lucia.createSession(result.userId, {});
		const cookie = lucia.createSessionCookie(session.id);
		cookies.set(cookie.name, cookie.value, { path: '.', ...cookie.attributes });
		redirect(303, landingFor(result.role, url.searchParams.get('next')));
	}
} satisfies Actions;
