import { json } from '@sveltejs/kit';
import { acceptSchema } from '$lib/schemas/floor';
import { requireRole } from '$lib/server/auth';
import { acceptEntry } from '$lib/server/floor/queue';
import { orError } from '$lib/server/http';
import { readBody } from '$lib/server/request';
import type { RequestHandler } from './$types';

/** The foreman accepts an out-of-spec value, with a reason (foreman and owner only). */
export const POST: RequestHandler = async ({ params, request }) => {
	const user = requireRole('foreman', 'owner');
	const body = await readBody(request, acceptSchema, 'The body must be JSON: { reason }.');
	const { id } = orError(await acceptEntry(user, params.entryId, body.reason));
	return json({ id }, { status: 201 });
};
