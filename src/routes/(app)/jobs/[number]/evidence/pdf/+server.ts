import { Readable } from 'node:stream';
import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth';
import { evidenceForJob, evidencePdfForJob } from '$lib/server/evidence-for-job';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params }) => {
	const user = requireRole('owner', 'foreman', 'service_writer');
	const pack = await evidenceForJob(user.shopId, params.number);
	if (!pack) error(404, 'No such job card in this shop.');
	// Sent as it is drawn: a pack with hundreds of photos is never held whole in memory.
	const pdf = Readable.toWeb(evidencePdfForJob(pack)) as ReadableStream<Uint8Array>;
	return new Response(pdf, {
		headers: {
			'content-type': 'application/pdf',
			'content-disposition': `attachment; filename="evidence-job-${pack.job.number}.pdf"`,
			'cache-control': 'private, no-store'
		}
	});
};
