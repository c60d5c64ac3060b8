import { createHmac } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from './db';
import { makeShop } from './db/fixtures';
import * as s from './db/schema';
import { addManualLine, makeDraft } from './invoice-lines';
import { creditInvoice, getInvoice, issueInvoice } from './invoices';
import { applyCheckoutCompleted, recordPayment } from './payments';
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
			kind: 'not_found'
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
		expect(r).toMatchObject({ ok: false, kind: 'not_found' });
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

describe('money the provider took is never lost', () => {
	const secret = 'whsec_test_secret_for_db_tests';

	it('records a checkout paid after the invoice was credited, as a refund due', async () => {
		const f = await makeShop('Credited then paid');
		const d = await readyDraft(f, 800, 4200);
		expect((await issueInvoice(f.shop.id, d.invoiceId, f.owner.id)).ok).toBe(true);
		const credit = await creditInvoice(f.shop.id, d.invoiceId, f.owner.id, 'wrong customer');
		expect(credit.ok).toBe(true);
		const payload = completedEvent('evt_after_credit', f.shop.id, d.invoiceId, 4200);
		expect(await handleWebhook(payload, sign(payload, secret), secret)).toEqual({
			status: 200,
			body: 'Applied: refund due.'
		});
		const inv = await getInvoice(f.shop.id, d.invoiceId);
		expect(inv?.status).toBe('credited');
		expect(inv?.payments).toHaveLength(1);
		expect(inv?.refundDueMinor).toBe(4200);
		expect(await handleWebhook(payload, sign(payload, secret), secret)).toEqual({
			status: 200,
			body: 'Already applied.'
		});
		expect((await getInvoice(f.shop.id, d.invoiceId))?.payments).toHaveLength(1);
	});

	it('shows a second paid checkout as a refund due, not as lost', async () => {
		const f = await makeShop('Paid twice');
		const d = await readyDraft(f, 801, 1500);
		await issueInvoice(f.shop.id, d.invoiceId, f.owner.id);
		const cash = await recordPayment(f.shop.id, d.invoiceId, {
			method: 'cash',
			amountMinor: 1500,
			byUserId: f.owner.id
		});
		expect(cash).toMatchObject({ ok: true, paid: true });
		const payload = completedEvent('evt_paid_twice', f.shop.id, d.invoiceId, 1500);
		expect((await handleWebhook(payload, sign(payload, secret), secret)).status).toBe(200);
		const inv = await getInvoice(f.shop.id, d.invoiceId);
		expect(inv?.paidMinor).toBe(3000);
		expect(inv?.refundDueMinor).toBe(1500);
	});

	it('never answers a refused event as handled on a repeat delivery', async () => {
		const f = await makeShop('Refused twice');
		const d = await readyDraft(f, 802, 1000);
		await issueInvoice(f.shop.id, d.invoiceId, f.owner.id);
		const credit = await creditInvoice(f.shop.id, d.invoiceId, f.owner.id, 'typing slip');
		if (!credit.ok) throw new Error(credit.message);
		// A checkout can only be for an invoice: one naming the credit note is refused, every time.
		const payload = completedEvent('evt_on_note', f.shop.id, credit.creditNoteId, 1000);
		const first = await handleWebhook(payload, sign(payload, secret), secret);
		expect(first.status).toBe(400);
		const again = await handleWebhook(payload, sign(payload, secret), secret);
		expect(again).toEqual(first);
		const seen = await db
			.select()
			.from(s.webhookEvent)
			.where(eq(s.webhookEvent.eventId, 'evt_on_note'));
		expect(seen).toHaveLength(0);
	});

	it('answers a signed event with an enormous amount with 400 and words, storing nothing', async () => {
		const f = await makeShop('Enormous');
		const d = await readyDraft(f, 803, 1000);
		await issueInvoice(f.shop.id, d.invoiceId, f.owner.id);
		for (const amount of [99_999_999_999_999, 2_147_483_648, 1e300]) {
			const payload = completedEvent(`evt_big_${amount}`, f.shop.id, d.invoiceId, amount);
			const r = await handleWebhook(payload, sign(payload, secret), secret);
			expect(r.status, String(amount)).toBe(400);
			expect(r.body).toMatch(/amount_total must be a whole amount/);
		}
		expect((await getInvoice(f.shop.id, d.invoiceId))?.payments).toHaveLength(0);
	});
});

describe('amounts that cannot be stored are refused with words', () => {
	it('refuses a line of 10 000 × 9 999 999.99', async () => {
		const f = await makeShop('Huge line');
		const d = await readyDraft(f, 810, 100);
		const r = await addManualLine(f.shop.id, d.invoiceId, {
			kind: 'sundry',
			description: 'Too much',
			quantity: 10_000,
			unitPriceMinor: 999_999_999
		});
		expect(r).toMatchObject({ ok: false, message: expect.stringMatching(/too large/) });
		expect((await getInvoice(f.shop.id, d.invoiceId))?.lines).toHaveLength(1);
	});

	it('refuses lines whose sum no longer fits, keeping the draft as it was', async () => {
		const f = await makeShop('Huge sum');
		const d = await readyDraft(f, 811, 2_000_000_000);
		const r = await addManualLine(f.shop.id, d.invoiceId, {
			kind: 'sundry',
			description: 'One more',
			quantity: 1,
			unitPriceMinor: 2_000_000_000
		});
		expect(r).toMatchObject({ ok: false, message: expect.stringMatching(/too large/) });
		const inv = await getInvoice(f.shop.id, d.invoiceId);
		expect(inv?.lines).toHaveLength(1);
		expect(inv?.totalMinor).toBe(2_000_000_000);
	});

	it('bounds counter payments by what is owed and refuses them on a paid invoice', async () => {
		const f = await makeShop('Counter bounds');
		const d = await readyDraft(f, 812, 3000);
		await issueInvoice(f.shop.id, d.invoiceId, f.owner.id);
		const over = await recordPayment(f.shop.id, d.invoiceId, {
			method: 'cash',
			amountMinor: 3001,
			byUserId: f.owner.id
		});
		expect(over).toMatchObject({ ok: false, message: expect.stringMatching(/more than is owed/) });
		const huge = await recordPayment(f.shop.id, d.invoiceId, {
			method: 'cash',
			amountMinor: 9_999_999_999_900,
			byUserId: f.owner.id
		});
		expect(huge.ok).toBe(false);
		const all = await recordPayment(f.shop.id, d.invoiceId, {
			method: 'card',
			amountMinor: 3000,
			byUserId: f.owner.id
		});
		expect(all).toMatchObject({ ok: true, paid: true });
		const after = await recordPayment(f.shop.id, d.invoiceId, {
			method: 'cash',
			amountMinor: 1,
			byUserId: f.owner.id
		});
		expect(after).toMatchObject({ ok: false, message: expect.stringMatching(/paid in full/) });
		expect((await getInvoice(f.shop.id, d.invoiceId))?.payments).toHaveLength(1);
	});
});
