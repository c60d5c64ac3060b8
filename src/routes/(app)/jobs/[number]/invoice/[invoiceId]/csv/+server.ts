import { error } from '@sveltejs/kit';
import { linesCsv } from '$lib/invoice/csv';
import { isUuid } from '$lib/ids';
import { requireRole } from '$lib/server/auth';
import { findJobByNumber, getInvoice } from '$lib/server/invoices';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params }) => {
	const user = requireRole('service_writer', 'owner');
	if (!/^\d{1,9}$/.test(params.number) || !isUuid(params.invoiceId)) {
		error(404, 'No such invoice.');
	}
	const job = await findJobByNumber(user.shopId, Number(params.number));
	const inv = job ? await getInvoice(user.shopId, params.invoiceId) : null;
	if (!job || !inv || inv.jobId !== job.id) error(404, 'No such invoice in this shop.');
	const name = inv.status === 'draft' ? `draft-job-${job.number}` : `lines-${inv.number}`;
	return new Response(linesCsv(inv.lines, inv.currency), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${name}.csv"`,
			'cache-control': 'private, no-store'
		}
	});
};
