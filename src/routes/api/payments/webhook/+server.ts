// The payment provider's webhook. No sign-in: the provider is not a user. The guard is the
// signature, verified with the provider's SDK against STRIPE_WEBHOOK_SECRET; anything not
// signed with it is refused with 400 before it touches the database.
import { env } from '$env/dynamic/private';
import { handleWebhook } from '$lib/server/payments';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ request }) => {
	const raw = await request.text();
	if (raw.length > 512 * 1024) return new Response('Too large.', { status: 413 });
	const r = await handleWebhook(
		raw,
		request.headers.get('stripe-signature'),
		env.STRIPE_WEBHOOK_SECRET
	);
	return new Response(r.body, { status: r.status, headers: { 'content-type': 'text/plain' } });
};
