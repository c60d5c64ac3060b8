import { error } from '@sveltejs/kit';
import { invoicePdf } from '$lib/server/invoice-pdf';
import { findJobByNumber, getInvoice, invoiceByToken } from '$lib/server/invoices';
import { workReport } from '$lib/server/work-report';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params }) => {
	const found = await invoiceByToken(params.token);
	if (!found) error(404, 'This page does not exist.');
	const { invoice, shop, jobNumber } = found;
	const job = (await findJobByNumber(invoice.shopId, jobNumber))!;
	const credited = invoice.creditFor ? await getInvoice(invoice.shopId, invoice.creditFor) : null;
	const pdf = await invoicePdf({
		shop,
		job,
		invoice,
		report: await workReport(invoice.shopId, invoice.jobId),
		creditForNumber: credited?.number ?? null
	});
	return new Response(new Uint8Array(pdf), {
		headers: {
			'content-type': 'application/pdf',
			'content-disposition': `inline; filename="${invoice.kind === 'credit_note' ? 'credit-note' : 'invoice'}-${invoice.number}.pdf"`,
			'cache-control': 'private, no-store'
		}
	});
};
