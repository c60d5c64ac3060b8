// Online payment through the provider's official SDK (stripe). In development and tests the
// SDK points at the local fake provider that `npm start` / `npm test` run (STRIPE_API_HOST,
// STRIPE_API_PORT, STRIPE_API_PROTOCOL); in production those are unset and it talks to the
// real service with STRIPE_SECRET_KEY. Webhooks are verified with the SDK's constructEvent.
import { env } from '$env/dynamic/private';
import Stripe from 'stripe';
import { z } from 'zod';
import { isUuid } from '$lib/ids';
import { MAX_AMOUNT_MINOR } from '$lib/money';
import { applyCheckoutCompleted, setCheckoutSession, type InvoiceWithLines } from './invoices';

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
	if (!r.ok) return { status: r.status ?? 400, body: r.message };
	if (r.duplicate) return { status: 200, body: 'Already applied.' };
	return { status: 200, body: r.refundDueMinor > 0 ? 'Applied: refund due.' : 'Applied.' };
}
