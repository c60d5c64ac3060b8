import { json } from '@sveltejs/kit';
import { redoSchema } from '$lib/schemas/floor';
import { requireRole } from '$lib/server/auth';
import { orderRedo } from '$lib/server/floor/queue';
import { orError } from '$lib/server/http';
import { readBody } from '$lib/server/request';
import type { RequestHandler } from './$types';

/** The foreman orders a redo of an out-of-spec step, with a note for the technician (foreman and owner only). */
export const POST: RequestHandler = async ({ params, request }) => {
	const user = requireRole('foreman', 'owner');
	const body = await readBody(request, redoSchema, 'The body must be JSON: { note }.');
	const { id } = orError(await orderRedo(user, params.entryId, body.note));
	return json({ id }, { status: 201 });
};
