// The pay button: a link (the provider's page is on another origin, which the CSP's
// form-action would not let a form post reach). Makes or reuses the checkout for what is
// owed and sends the customer there; on trouble, back to the page with the reason.
import { error, redirect } from '@sveltejs/kit';
import { invoiceByToken } from '$lib/server/invoices';
import { checkoutUrl } from '$lib/server/payments';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params, url }) => {
	const found = await invoiceByToken(params.token);
	if (!found) error(404, 'This page does not exist.');
	const back = `${url.origin}/r/${params.token}`;
	const r = await checkoutUrl(found.invoice, { shopName: found.shop.name, returnUrl: back });
	redirect(303, r.ok ? r.url : `${back}?payerror=${encodeURIComponent(r.message)}`);
};
