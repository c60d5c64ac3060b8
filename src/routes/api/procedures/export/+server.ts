import { procedureReaders } from '$lib/procedures/access';
import { requireRole } from '$lib/server/auth';
import { exportProcedures } from '$lib/server/procedures';
import type { RequestHandler } from './$types';

/** The shop's library (not archived) as a Benchcall procedure file. */
export const GET: RequestHandler = async () => {
	const user = requireRole(...procedureReaders);
	const file = await exportProcedures(user.shopId);
	const day = new Date().toISOString().slice(0, 10);
	return new Response(JSON.stringify(file, null, '\t'), {
		headers: {
			'content-type': 'application/json; charset=utf-8',
			'content-disposition': `attachment; filename="benchcall-procedures-${day}.json"`
		}
	});
};
