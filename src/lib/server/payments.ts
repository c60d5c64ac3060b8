// Online payment through the provider's official SDK (stripe). In development and tests the
// SDK points at the local fake provider that `npm start` / `npm test` run (STRIPE_API_HOST,
// STRIPE_API_PORT, STRIPE_API_PROTOCOL); in production those are unset and it talks to the
// real service with STRIPE_SECRET_KEY. Webhooks are verified with the SDK's constructEvent.
// Payments are recorded here too, at the counter or from the provider's webhook, once each.
import { env } from '$env/dynamic/private';
import Stripe from 'stripe';
import { z } from 'zod';
import { isUuid } from '$lib/ids';
import { and, eq, sql } from 'drizzle-orm';
import { MAX_AMOUNT_MINOR, toDecimalString } from '$lib/money';
import { failure, failureStatus, type Result } from '$lib/result';
import { db, type Tx } from './db';
import { invoice, job, payment, webhookEvent } from './db/schema';
import { transitionJob } from './jobs';

import { lockInvoice, refusal, Refused } from './invoice-change';
import { refundDue, type InvoiceWithLines } from './invoices';

export function paymentsClient(): Stripe | null {
	const key = env.STRIPE_SECRET_KEY;
	if (!key) return null;
	const config: Stripe.StripeConfig = {};
	if (env.STRIPE_API_HOST) config.host = env.STRIPE_API_HOST;
	if (env.STRIPE_API_PORT) config.port = Number(env.STRIPE_API_PORT);
	if (env.STRIPE_API_PROTOCOL === 'http' || env.STRIPE_API_PROTOCOL === 'https') {
		config.protocol = env.STRIPE_API_PROTOCOL;
	}
	return new Stripe(key, config);
}

/**
 * The provider's checkout page for what is still owed on an invoice: reuses the open session
 * when there is one for the same amount, otherwise makes a new one.
 */
export async function checkoutUrl(
	inv: InvoiceWithLines,
	opts: { shopName: string; returnUrl: string }
): Promise<{ ok: true; url: string } | { ok: false; message: string }> {
	const stripe = paymentsClient();
	if (!stripe) return { ok: false, message: 'Online payment is not set up for this shop.' };
	const owed = inv.totalMinor - inv.paidMinor;
	if (inv.status !== 'issued' || owed <= 0) {
		return { ok: false, message: 'Nothing is owed on this invoice.' };
	}
	try {
		if (inv.checkoutSessionId) {
			const s = await stripe.checkout.sessions.retrieve(inv.checkoutSessionId);
			if (s.status === 'open' && s.amount_total === owed && s.url) return { ok: true, url: s.url };
			// An open page for another amount must not stay payable beside the new one.
			if (s.status === 'open') await stripe.checkout.sessions.expire(s.id);
		}
		const s = await stripe.checkout.sessions.create({
			mode: 'payment',
			client_reference_id: inv.id,
			metadata: { invoice_id: inv.id, shop_id: inv.shopId },
			line_items: [
				{
					quantity: 1,
					price_data: {
						currency: inv.currency.toLowerCase(),
						unit_amount: owed,
						product_data: { name: `${opts.shopName}: invoice ${inv.number}` }
					}
				}
			],
			success_url: `${opts.returnUrl}?paid=1`,
			cancel_url: opts.returnUrl
		});
		await setCheckoutSession(inv.shopId, inv.id, s.id);
		if (!s.url) return { ok: false, message: 'The payment provider gave no page to pay on.' };
		return { ok: true, url: s.url };
	} catch (err) {
		console.error('payment provider', err);
		return {
			ok: false,
			message: 'The payment provider could not be reached. Try again in a minute.'
		};
	}
}

/**
 * Closes a checkout page at the provider so it can no longer be paid (after a credit note).
 * A page already completed or expired is left as it is. Answers whether the provider was
 * reached; when it was not, a payment that still comes is recorded as a refund due.
 */
export async function expireCheckout(sessionId: string | null): Promise<boolean> {
	if (!sessionId) return true;
	const stripe = paymentsClient();
	if (!stripe) return true;
	try {
		const s = await stripe.checkout.sessions.retrieve(sessionId);
		if (s.status === 'open') await stripe.checkout.sessions.expire(sessionId);
		return true;
	} catch (err) {
		console.error('payment provider: could not expire checkout', sessionId, err);
		return false;
	}
}

/** The parts of a completed checkout session Benchcall relies on, with their bounds. */
const completedSession = z.object({
	id: z.string().min(1).max(255),
	payment_status: z.string(),
	amount_total: z.number().int().min(1).max(MAX_AMOUNT_MINOR).nullable(),
	currency: z
		.string()
		.regex(/^[a-z]{3}$/i)
		.nullable(),
	metadata: z
		.object({ invoice_id: z.string().optional(), shop_id: z.string().optional() })
		.nullable()
		.optional()
});

/**
 * Handles one webhook delivery. A bad or missing signature is refused (400); a completed
 * checkout is applied once, however often it is delivered. Answers the HTTP status and text.
 */
export async function handleWebhook(
	rawBody: string,
	signature: string | null,
	secret: string | undefined
): Promise<{ status: number; body: string }> {
	if (!secret) return { status: 503, body: 'Webhooks are not set up (STRIPE_WEBHOOK_SECRET).' };
	if (!signature) return { status: 400, body: 'Missing signature.' };
	let event: Stripe.Event;
	try {
		event = Stripe.webhooks.constructEvent(rawBody, signature, secret);
	} catch {
		return { status: 400, body: 'Bad signature.' };
	}
	if (event.type !== 'checkout.session.completed') {
		return { status: 200, body: `Ignored ${event.type}.` };
	}
	const parsed = completedSession.safeParse(event.data.object);
	if (!parsed.success) {
		return {
			status: 400,
			body: `The checkout cannot be recorded: amount_total must be a whole amount from 1 to ${MAX_AMOUNT_MINOR} minor units, with a three-letter currency.`
		};
	}
	const s = parsed.data;
	const invoiceId = s.metadata?.invoice_id;
	const shopId = s.metadata?.shop_id;
	if (!invoiceId || !shopId || !isUuid(invoiceId) || !isUuid(shopId)) {
		return { status: 400, body: 'The checkout names no invoice.' };
	}
	if (s.payment_status !== 'paid' || typeof s.amount_total !== 'number') {
		return { status: 200, body: 'Not paid yet.' };
	}
	const r = await applyCheckoutCompleted({
		eventId: event.id,
		type: event.type,
		invoiceId,
		shopId,
		sessionId: s.id,
		amountMinor: s.amount_total,
		currency: s.currency ?? ''
	});
	if (!r.ok) return { status: failureStatus[r.kind], body: r.message };
	if (r.duplicate) return { status: 200, body: 'Already applied.' };
	return { status: 200, body: r.refundDueMinor > 0 ? 'Applied: refund due.' : 'Applied.' };
}

/**
 * Records a payment. With a provider reference it is recorded at most once (a repeated
 * webhook finds the reference taken and changes nothing). Once the payments reach the total
 * the invoice is paid and the job moves invoiced → paid.
 *
 * Money the provider already took is always recorded, whatever became of the invoice since the
 * checkout began (credited, or paid another way): it then shows as a refund due. A payment at
 * the counter is refused on an invoice that is paid or credited, and above what is still owed.
 */
export async function recordPayment(
	shopId: string,
	invoiceId: string,
	p: {
		method: 'cash' | 'card' | 'online';
		amountMinor: number;
		providerReference?: string | null;
		byUserId?: string | null;
	},
	outer?: Tx
): Promise<Result<{ recorded: boolean; paid: boolean }>> {
	const run = async (tx: Tx): Promise<Result<{ recorded: boolean; paid: boolean }>> => {
		const row = await lockInvoice(tx, shopId, invoiceId);
		if (!row) return failure('not_found', 'No such invoice in this shop.');
		const taken = Boolean(p.providerReference);
		const open = row.status === 'issued' || row.status === 'paid';
		if (row.kind !== 'invoice' || !(open || (taken && row.status === 'credited'))) {
			return failure('invalid', 'Payments are taken on an issued invoice only.');
		}
		if (!Number.isInteger(p.amountMinor) || p.amountMinor <= 0) {
			return failure('invalid', 'The amount must be more than zero.');
		}
		if (p.amountMinor > MAX_AMOUNT_MINOR) {
			return failure('invalid', 'The amount is larger than any invoice Benchcall keeps.');
		}
		const [{ before }] = await tx
			.select({ before: sql<string>`coalesce(sum(${payment.amountMinor}), 0)::bigint` })
			.from(payment)
			.where(and(eq(payment.shopId, shopId), eq(payment.invoiceId, invoiceId)));
		if (!taken) {
			if (row.status === 'paid') {
				return failure('conflict', 'This invoice is paid in full: nothing is owed.');
			}
			const owed = row.totalMinor - Number(before);
			if (p.amountMinor > owed) {
				return failure(
					'invalid',
					`That is more than is owed (${toDecimalString(owed, row.currency)} ${row.currency}).`
				);
			}
		}
		const inserted = await tx
			.insert(payment)
			.values({
				shopId,
				invoiceId,
				method: p.method,
				amountMinor: p.amountMinor,
				providerReference: p.providerReference ?? null,
				recordedBy: p.byUserId ?? null
			})
			.onConflictDoNothing({ target: payment.providerReference })
			.returning({ id: payment.id });
		const recorded = inserted.length > 0;
		const paid = Number(before) + (recorded ? p.amountMinor : 0);
		const nowPaid = row.status !== 'credited' && paid >= row.totalMinor;
		if (nowPaid && row.status === 'issued') {
			await tx
				.update(invoice)
				.set({ status: 'paid', paidAt: new Date(), updatedAt: new Date() })
				.where(eq(invoice.id, invoiceId));
			const [j] = await tx.select({ state: job.state }).from(job).where(eq(job.id, row.jobId));
			if (j?.state === 'invoiced') {
				const moved = await transitionJob(shopId, row.jobId, 'paid', {
					byUserId: p.byUserId ?? row.issuedBy ?? row.createdBy ?? '',
					tx
				});
				if (!moved.ok) throw new Error(moved.message);
			}
		}
		return { ok: true, recorded, paid: nowPaid };
	};
	return outer ? run(outer) : db.transaction(run);
}

export async function setCheckoutSession(shopId: string, invoiceId: string, sessionId: string) {
	await db
		.update(invoice)
		.set({ checkoutSessionId: sessionId })
		.where(and(eq(invoice.shopId, shopId), eq(invoice.id, invoiceId)));
}

/**
 * A completed checkout from the provider's webhook, handled exactly once: the event id is
 * recorded in the same transaction as the payment, so a repeat finds it and does nothing. A
 * refused event leaves nothing behind (the transaction rolls back), so a repeat is refused too
 * rather than answered as handled.
 */
type Applied = Result<{ duplicate: boolean; refundDueMinor: number }>;

export async function applyCheckoutCompleted(ev: {
	eventId: string;
	type: string;
	invoiceId: string;
	shopId: string;
	sessionId: string;
	amountMinor: number;
	currency: string;
}): Promise<Applied> {
	const answer: Promise<Applied> = db.transaction(async (tx) => {
		const [inv] = await tx
			.select()
			.from(invoice)
			.where(and(eq(invoice.shopId, ev.shopId), eq(invoice.id, ev.invoiceId)));
		if (!inv) throw new Refused(failure('not_found', 'No such invoice.'));
		if (inv.currency.toLowerCase() !== ev.currency.toLowerCase()) {
			throw new Refused(failure('invalid', 'The payment is in another currency.'));
		}
		const fresh = await tx
			.insert(webhookEvent)
			.values({ eventId: ev.eventId, shopId: ev.shopId, type: ev.type })
			.onConflictDoNothing()
			.returning({ id: webhookEvent.eventId });
		const r =
			fresh.length === 0
				? { ok: true as const, recorded: false }
				: await recordPayment(
						ev.shopId,
						ev.invoiceId,
						{ method: 'online', amountMinor: ev.amountMinor, providerReference: ev.sessionId },
						tx
					);
		if (!r.ok) throw new Refused(r);
		const [after] = await tx
			.select({ status: invoice.status, total: invoice.totalMinor })
			.from(invoice)
			.where(eq(invoice.id, ev.invoiceId));
		const [{ paid }] = await tx
			.select({ paid: sql<string>`coalesce(sum(${payment.amountMinor}), 0)::bigint` })
			.from(payment)
			.where(and(eq(payment.shopId, ev.shopId), eq(payment.invoiceId, ev.invoiceId)));
		return {
			ok: true as const,
			duplicate: !r.recorded,
			refundDueMinor: refundDue(after.status, after.total, Number(paid))
		};
	});
	return answer.catch(refusal);
}
