import { createHmac } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from './db';
import { makeShop } from './db/fixtures';
import * as s from './db/schema';
import {
	addManualLine,
	applyCheckoutCompleted,
	getInvoice,
	issueInvoice,
	makeDraft,
	recordPayment
} from './invoices';
import { handleWebhook } from './payments';

/** A job of the fixture shop, ready to invoice, with a draft holding one sundry line. */
async function readyDraft(
	f: Awaited<ReturnType<typeof makeShop>>,
	number: number,
	priceMinor = 1000
) {
	const [j] = await db
		.insert(s.job)
		.values({ shopId: f.shop.id, number, state: 'ready_to_invoice', customerId: f.customer.id })
		.returning();
	const d = await makeDraft(f.shop.id, j.id, f.owner.id, 'flat_rate');
	if (!d.ok) throw new Error(d.message);
	const added = await addManualLine(f.shop.id, d.invoiceId, {
		kind: 'sundry',
		description: 'Workshop consumables',
		quantity: 1,
		unitPriceMinor: priceMinor
	});
	if (!added.ok) throw new Error(added.message);
	return { jobId: j.id, invoiceId: d.invoiceId };
}

/** Signs a payload the way the provider does: t=<ts>,v1=<hex HMAC-SHA256 of "<ts>.<payload>">. */
function sign(payload: string, secret: string, t = Math.floor(Date.now() / 1000)) {
	return `t=${t},v1=${createHmac('sha256', secret).update(`${t}.${payload}`).digest('hex')}`;
}

function completedEvent(eventId: string, shopId: string, invoiceId: string, amount: number) {
	return JSON.stringify({
		id: eventId,
		object: 'event',
		type: 'checkout.session.completed',
		created: Math.floor(Date.now() / 1000),
		livemode: false,
		data: {
			object: {
				id: `cs_test_${invoiceId.slice(0, 8)}`,
				object: 'checkout.session',
				amount_total: amount,
				currency: 'eur',
				payment_status: 'paid',
				status: 'complete',
				metadata: { invoice_id: invoiceId, shop_id: shopId }
			}
		}
	});
}

describe('issuing invoices', () => {
	it('gives gapless, unique numbers when many are issued at once', async () => {
		const f = await makeShop('Issuing');
		const drafts = [];
		for (let n = 0; n < 8; n++) drafts.push(await readyDraft(f, 100 + n));
		const results = await Promise.all(
			drafts.map((d) => issueInvoice(f.shop.id, d.invoiceId, f.owner.id))
		);
		const numbers = results.map((r) => (r.ok ? r.number : -1)).sort((a, b) => a - b);
		expect(numbers).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
		// The jobs moved to invoiced with the change recorded.
		const jobs = await db.select().from(s.job).where(eq(s.job.shopId, f.shop.id));
		expect(jobs.filter((j) => j.state === 'invoiced')).toHaveLength(8);
	});

	it('freezes an issued invoice and refuses a job not ready to invoice', async () => {
		const f = await makeShop('Frozen');
		const d = await readyDraft(f, 200);
		expect((await issueInvoice(f.shop.id, d.invoiceId, f.owner.id)).ok).toBe(true);
		const again = await addManualLine(f.shop.id, d.invoiceId, {
			kind: 'sundry',
			description: 'late',
			quantity: 1,
			unitPriceMinor: 1
		});
		expect(again).toMatchObject({ ok: false, message: expect.stringMatching(/credit note/) });
		const inWork = await makeDraft(f.shop.id, f.job.id, f.owner.id);
		expect(inWork).toMatchObject({ ok: false, message: expect.stringMatching(/ready to invoice/) });
	});

	it('keeps another shop out', async () => {
		const a = await makeShop('Shop A');
		const b = await makeShop('Shop B');
		const d = await readyDraft(a, 300);
		expect(await getInvoice(b.shop.id, d.invoiceId)).toBeNull();
		expect(await issueInvoice(b.shop.id, d.invoiceId, b.owner.id)).toMatchObject({
			ok: false,
			status: 404
		});
	});
});

describe('payments', () => {
	const secret = 'whsec_test_secret_for_db_tests';

	it('applies a signed webhook once, however often it comes, and pays the job', async () => {
		const f = await makeShop('Webhook');
		const d = await readyDraft(f, 400, 2500);
		expect((await issueInvoice(f.shop.id, d.invoiceId, f.owner.id)).ok).toBe(true);
		// The fixture shop charges no tax (the default), so the total is the 25.00 line.
		const payload = completedEvent('evt_test_1', f.shop.id, d.invoiceId, 2500);
		const first = await handleWebhook(payload, sign(payload, secret), secret);
		expect(first).toEqual({ status: 200, body: 'Applied.' });
		const repeat = await handleWebhook(payload, sign(payload, secret), secret);
		expect(repeat).toEqual({ status: 200, body: 'Already applied.' });
		// The same checkout under a new event id (a provider retry) still pays only once.
		const other = completedEvent('evt_test_2', f.shop.id, d.invoiceId, 2500);
		expect(await handleWebhook(other, sign(other, secret), secret)).toEqual({
			status: 200,
			body: 'Already applied.'
		});
		const inv = await getInvoice(f.shop.id, d.invoiceId);
		expect(inv?.payments).toHaveLength(1);
		expect(inv?.status).toBe('paid');
		const [j] = await db
			.select()
			.from(s.job)
			.where(and(eq(s.job.shopId, f.shop.id), eq(s.job.id, d.jobId)));
		expect(j.state).toBe('paid');
	});

	it('refuses a forged or tampered signature and a missing one', async () => {
		const f = await makeShop('Forged');
		const d = await readyDraft(f, 500, 900);
		await issueInvoice(f.shop.id, d.invoiceId, f.owner.id);
		const payload = completedEvent('evt_forged', f.shop.id, d.invoiceId, 900);
		expect(await handleWebhook(payload, sign(payload, 'whsec_wrong'), secret)).toEqual({
			status: 400,
			body: 'Bad signature.'
		});
		const tampered = payload.replace('"amount_total":900', '"amount_total":1');
		expect(tampered).not.toBe(payload);
		expect((await handleWebhook(tampered, sign(payload, secret), secret)).status).toBe(400);
		expect((await handleWebhook(payload, null, secret)).status).toBe(400);
		expect((await getInvoice(f.shop.id, d.invoiceId))?.status).toBe('issued');
	});

	it('answers 404 for an invoice of another shop named in a signed event', async () => {
		const a = await makeShop('Pay A');
		const b = await makeShop('Pay B');
		const d = await readyDraft(a, 600);
		await issueInvoice(a.shop.id, d.invoiceId, a.owner.id);
		const r = await applyCheckoutCompleted({
			eventId: 'evt_cross',
			type: 'checkout.session.completed',
			invoiceId: d.invoiceId,
			shopId: b.shop.id,
			sessionId: 'cs_cross',
			amountMinor: 1000,
			currency: 'EUR'
		});
		expect(r).toMatchObject({ ok: false, status: 404 });
	});

	it('records counter payments until the total is reached', async () => {
		const f = await makeShop('Counter');
		const d = await readyDraft(f, 700, 3000);
		await issueInvoice(f.shop.id, d.invoiceId, f.owner.id);
		const part1 = await recordPayment(f.shop.id, d.invoiceId, {
			method: 'cash',
			amountMinor: 1000,
			byUserId: f.owner.id
		});
		expect(part1).toEqual({ ok: true, recorded: true, paid: false });
		const part2 = await recordPayment(f.shop.id, d.invoiceId, {
			method: 'card',
			amountMinor: 2000,
			byUserId: f.owner.id
		});
		expect(part2).toEqual({ ok: true, recorded: true, paid: true });
		expect((await getInvoice(f.shop.id, d.invoiceId))?.status).toBe('paid');
	});
});
