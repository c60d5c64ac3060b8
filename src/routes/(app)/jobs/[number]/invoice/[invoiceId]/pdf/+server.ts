import { error } from '@sveltejs/kit';
import { isUuid } from '$lib/ids';
import { requireRole } from '$lib/server/auth';
import { invoicePdf } from '$lib/server/invoice-pdf';
import { findJobByNumber, getInvoice } from '$lib/server/invoices';
import { getShop } from '$lib/server/shop';
import { workReport } from '$lib/server/work-report';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params }) => {
	const user = requireRole('service_writer', 'owner');
	if (!/^\d{1,9}$/.test(params.number) || !isUuid(params.invoiceId)) {
		error(404, 'No such invoice.');
	}
	const job = await findJobByNumber(user.shopId, Number(params.number));
	const inv = job ? await getInvoice(user.shopId, params.invoiceId) : null;
	if (!job || !inv || inv.jobId !== job.id) error(404, 'No such invoice in this shop.');
	const credited = inv.creditFor ? await getInvoice(user.shopId, inv.creditFor) : null;
	const pdf = await invoicePdf({
		shop: (await getShop(user.shopId))!,
		job,
		invoice: inv,
		report: await workReport(user.shopId, job.id),
		creditForNumber: credited?.number ?? null
	});
	const name =
		inv.status === 'draft'
			? `draft-job-${job.number}.pdf`
			: `${inv.kind === 'credit_note' ? 'credit-note' : 'invoice'}-${inv.number}.pdf`;
	return new Response(new Uint8Array(pdf), {
		headers: {
			'content-type': 'application/pdf',
			'content-disposition': `attachment; filename="${name}"`,
			'cache-control': 'private, no-store'
		}
	});
};
