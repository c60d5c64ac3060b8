// The customer's private page: no sign-in; the unguessable token in the address is the key.
import { error } from '@sveltejs/kit';
import { invoiceByToken } from '$lib/server/invoices';
import { workReport } from '$lib/server/work-report';
import type { PageServerLoad } from './$types';

async function byToken(token: string) {
	const found = await invoiceByToken(token);
	if (!found) error(404, 'This page does not exist. Check the link in your e-mail.');
	return found;
}

export const load: PageServerLoad = async ({ params, setHeaders, url }) => {
	setHeaders({ 'cache-control': 'private, no-store', 'x-robots-tag': 'noindex' });
	const { invoice, shop, jobNumber } = await byToken(params.token);
	return {
		payError: url.searchParams.get('payerror'),
		invoice,
		shop: { name: shop.name },
		jobNumber,
		report: await workReport(invoice.shopId, invoice.jobId)
	};
};
