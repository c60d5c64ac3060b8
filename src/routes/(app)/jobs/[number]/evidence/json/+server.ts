import { error, json } from '@sveltejs/kit';
import { toJsonExport } from '$lib/evidence/pack';
import { requireRole } from '$lib/server/auth';
import { evidenceJsonForJob } from '$lib/server/evidence-for-job';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params }) => {
	const user = requireRole('owner', 'foreman', 'service_writer');
	const pack = await evidenceJsonForJob(user.shopId, params.number);
	if (!pack) error(404, 'No such job card in this shop.');
	return json(toJsonExport(pack), {
		headers: {
			'content-disposition': `attachment; filename="evidence-job-${pack.job.number}.json"`,
			'cache-control': 'private, no-store'
		}
	});
};
