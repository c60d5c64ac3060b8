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
	// Only what the customer reads: no shop, staff or checkout ids, no labour rate or tokens.
	return {
		payError: url.searchParams.get('payerror'),
		invoice: {
			kind: invoice.kind,
			number: invoice.number,
			status: invoice.status,
			currency: invoice.currency,
			issuedAt: invoice.issuedAt,
			paidAt: invoice.paidAt,
			paidMinor: invoice.paidMinor,
			subtotalMinor: invoice.subtotalMinor,
			taxMinor: invoice.taxMinor,
			taxRateBp: invoice.taxRateBp,
			totalMinor: invoice.totalMinor,
			lines: invoice.lines.map((l) => ({
				description: l.description,
				quantity: l.quantity,
				unit: l.unit,
				amountMinor: l.amountMinor
			}))
		},
		shop: { name: shop.name },
		// the shop's date and number style: the page reads it as the app's pages do
		shopStyle: { locale: shop.locale, timeZone: shop.timeZone },
		jobNumber,
		report: await workReport(invoice.shopId, invoice.jobId)
	};
};
