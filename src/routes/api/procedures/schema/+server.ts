import { json } from '@sveltejs/kit';
import { procedureFileJsonSchema } from '$lib/schemas/procedure';
import { requireUser } from '$lib/server/auth';
import type { RequestHandler } from './$types';

/** The JSON Schema of Benchcall's procedure file, generated from its zod schema. */
export const GET: RequestHandler = () => {
	requireUser();
	return json(procedureFileJsonSchema(), {
		headers: { 'content-type': 'application/schema+json; charset=utf-8' }
	});
};
