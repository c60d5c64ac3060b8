// The checkout pages at the provider, through the provider's SDK against the local fake
// (scripts/lib/fakes.js), which behaves as the real service: an expired session cannot be paid.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from './db';
import { makeShop } from './db/fixtures';
import * as s from './db/schema';
import { addManualLine, makeDraft } from './invoice-lines';
import { creditInvoice, getInvoice, issueInvoice } from './invoices';
import { checkoutUrl, expireCheckout } from './payments';

// The fake is plain JavaScript for the start scripts; loaded by path so type-checking stays out.
const fakesModule = new URL('../../../scripts/lib/fakes.js', import.meta.url).href;

let fake: { server: import('node:http').Server; port: number };

beforeAll(async () => {
	const secretKey = 'sk_test_closing_db_tests';
	const { startPaymentsFake } = await import(/* @vite-ignore */ fakesModule);
	fake = await startPaymentsFake({
		port: 0,
		secretKey,
		webhookSecret: 'whsec_unused',
		webhookUrl: 'http://127.0.0.1:9/unused'
	});
	process.env.STRIPE_SECRET_KEY = secretKey;
	process.env.STRIPE_API_HOST = '127.0.0.1';
	process.env.STRIPE_API_PORT = String(fake.port);
	process.env.STRIPE_API_PROTOCOL = 'http';
});

afterAll(() => new Promise<void>((done) => fake.server.close(() => done())));

async function issued(number: number, priceMinor: number) {
	const f = await makeShop(`Checkout ${number}`);
	const [j] = await db
		.insert(s.job)
		.values({ shopId: f.shop.id, number, state: 'ready_to_invoice', customerId: f.customer.id })
		.returning();
	const d = await makeDraft(f.shop.id, j.id, f.owner.id, 'flat_rate');
	if (!d.ok) throw new Error(d.message);
	await addManualLine(f.shop.id, d.invoiceId, {
		kind: 'sundry',
		description: 'Workshop consumables',
		quantity: 1,
		unitPriceMinor: priceMinor
	});
	const i = await issueInvoice(f.shop.id, d.invoiceId, f.owner.id);
	if (!i.ok) throw new Error(i.message);
	return { f, invoiceId: d.invoiceId };
}

describe('checkout pages at the provider', () => {
	it('a credit note closes the open checkout, so it can no longer be paid', async () => {
		const { f, invoiceId } = await issued(900, 2500);
		const inv = await getInvoice(f.shop.id, invoiceId);
		const page = await checkoutUrl(inv!, { shopName: 'Test', returnUrl: 'http://x/r/t' });
		if (!page.ok) throw new Error(page.message);
		expect((await fetch(page.url)).status).toBe(200);
		const credit = await creditInvoice(f.shop.id, invoiceId, f.owner.id, 'wrong vehicle');
		if (!credit.ok) throw new Error(credit.message);
		expect(credit.checkoutSessionId).toBeTruthy();
		expect(await expireCheckout(credit.checkoutSessionId)).toBe(true);
		const pay = await fetch(page.url, { method: 'POST', redirect: 'manual' });
		expect(pay.status).toBe(410);
		// Expiring again (a repeated credit action) is harmless.
		expect(await expireCheckout(credit.checkoutSessionId)).toBe(true);
	});

	it('a new amount closes the old page rather than leaving two payable', async () => {
		const { f, invoiceId } = await issued(901, 4000);
		const first = await checkoutUrl((await getInvoice(f.shop.id, invoiceId))!, {
			shopName: 'Test',
			returnUrl: 'http://x/r/t'
		});
		if (!first.ok) throw new Error(first.message);
		const inv = (await getInvoice(f.shop.id, invoiceId))!;
		// As if part were paid at the counter meanwhile: what is owed is now less.
		const second = await checkoutUrl(
			{ ...inv, paidMinor: 1000 },
			{ shopName: 'Test', returnUrl: 'http://x/r/t' }
		);
		if (!second.ok) throw new Error(second.message);
		expect(second.url).not.toBe(first.url);
		expect((await fetch(first.url, { method: 'POST', redirect: 'manual' })).status).toBe(410);
		expect((await fetch(second.url)).status).toBe(200);
	});
});
