// The customer's private page: no sign-in; the unguessable token in the address is the key.
import { error, fail, redirect } from '@sveltejs/kit';
import { invoiceByToken } from '$lib/server/invoices';
import { checkoutUrl } from '$lib/server/payments';
import { workReport } from '$lib/server/work-report';
import type { Actions, PageServerLoad } from './$types';

async function byToken(token: string) {
	const found = await invoiceByToken(token);
	if (!found) error(404, 'This page does not exist. Check the link in your e-mail.');
	return found;
}

export const load: PageServerLoad = async ({ params, setHeaders }) => {
	setHeaders({ 'cache-control': 'private, no-store', 'x-robots-tag': 'noindex' });
	const { invoice, shop, jobNumber } = await byToken(params.token);
	return {
		invoice,
		shop: { name: shop.name },
		jobNumber,
		report: await workReport(invoice.shopId, invoice.jobId)
	};
};

export const actions = {
	pay: async ({ params, url }) => {
		const { invoice, shop } = await byToken(params.token);
		const r = await checkoutUrl(invoice, {
			shopName: shop.name,
			returnUrl: `${url.origin}/r/${params.token}`
		});
		if (!r.ok) return fail(400, { error: r.message });
		redirect(303, r.url);
	}
} satisfies Actions;
