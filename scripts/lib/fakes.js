// Local stand-ins for the two hosted services Benchcall talks to, for development and tests:
//   - an SMTP sink on 127.0.0.1 (the smtp-server package) that accepts every message and keeps
//     a copy in .data/mail/, so nothing leaves the machine;
//   - a payment provider on 127.0.0.1 that answers the only calls Benchcall makes through the
//     official stripe SDK (create a Checkout Session, retrieve it, expire it), serves a "pay" page, and on
//     pay posts a webhook signed the way the real service signs: the Stripe-Signature header
//     `t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<payload>" with the endpoint secret>`.
// Production sets SMTP_URL and STRIPE_SECRET_KEY / STRIPE_WEBHOOK_SECRET instead; then the
// matching fake is not started.
import { createHmac, randomBytes } from 'node:crypto';
import { mkdirSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:http';
import { join } from 'node:path';

const HOST = '127.0.0.1';

/** Parses a form body with bracket keys (line_items[0][price_data][currency]=eur) into objects. */
export function parseForm(body) {
	const out = {};
	for (const [key, value] of new URLSearchParams(body)) {
		const path = key.replace(/\]/g, '').split('[');
		let node = out;
		path.forEach((p, i) => {
			if (i === path.length - 1) node[p] = value;
			else node = node[p] ??= {};
		});
	}
	return out;
}

/** The signature header the real service sends with every webhook. */
export function signPayload(payload, secret, timestamp = Math.floor(Date.now() / 1000)) {
	const v1 = createHmac('sha256', secret).update(`${timestamp}.${payload}`, 'utf8').digest('hex');
	return `t=${timestamp},v1=${v1}`;
}

const esc = (s) => String(s).replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

export function startPaymentsFake({ port = 12111, secretKey, webhookSecret, webhookUrl }) {
	const sessions = new Map();
	const events = new Map();
	const json = (res, status, body) => {
		res.writeHead(status, { 'content-type': 'application/json' });
		res.end(JSON.stringify(body));
	};
	const apiError = (res, status, message) =>
		json(res, status, { error: { type: 'invalid_request_error', message } });

	/**
	 * Posts the signed event to the app. Like the real service, a failed delivery (no answer,
	 * or a 5xx) is tried again, here a few times within seconds rather than over days.
	 */
	async function deliver(event) {
		const payload = JSON.stringify(event, null, 2);
		let status = 0;
		for (let attempt = 1; attempt <= 4; attempt++) {
			try {
				const r = await fetch(webhookUrl, {
					method: 'POST',
					headers: {
						'content-type': 'application/json',
						'stripe-signature': signPayload(payload, webhookSecret)
					},
					body: payload
				});
				status = r.status;
				if (status < 500) return status;
			} catch (err) {
				const cause = err.cause?.code ?? err.cause?.message ?? '';
				console.error(
					`[payments fake] webhook to ${webhookUrl} failed (try ${attempt}): ${err.message} ${cause}`
				);
			}
			await new Promise((r) => setTimeout(r, 250 * attempt));
		}
		return status;
	}

	const server = createServer(async (req, res) => {
		const url = new URL(req.url ?? '/', `http://${HOST}`);
		let body = '';
		for await (const chunk of req) body += chunk;
		try {
			if (url.pathname.startsWith('/v1/')) {
				if (req.headers.authorization !== `Bearer ${secretKey}`) {
					return apiError(res, 401, 'Invalid API key provided.');
				}
				if (req.method === 'POST' && url.pathname === '/v1/checkout/sessions') {
					const f = parseForm(body);
					const item = f.line_items?.['0'];
					const amount = Number(item?.price_data?.unit_amount);
					const quantity = Number(item?.quantity ?? 1);
					const currency = item?.price_data?.currency;
					if (!Number.isInteger(amount) || amount <= 0 || !currency || !f.success_url) {
						return apiError(res, 400, 'line_items[0][price_data] and success_url are required.');
					}
					const id = `cs_test_${randomBytes(12).toString('hex')}`;
					const session = {
						id,
						object: 'checkout.session',
						amount_total: amount * quantity,
						currency: String(currency).toLowerCase(),
						client_reference_id: f.client_reference_id ?? null,
						metadata: f.metadata ?? {},
						mode: f.mode ?? 'payment',
						payment_status: 'unpaid',
						status: 'open',
						success_url: f.success_url,
						cancel_url: f.cancel_url ?? null,
						payment_intent: null,
						description: item?.price_data?.product_data?.name ?? '',
						created: Math.floor(Date.now() / 1000),
						livemode: false,
						url: `http://${HOST}:${server.address().port}/pay/${id}`
					};
					sessions.set(id, session);
					return json(res, 200, session);
				}
				// As the real service: only an open session can be expired; it then cannot be paid.
				const ex = /^\/v1\/checkout\/sessions\/([\w-]+)\/expire$/.exec(url.pathname);
				if (req.method === 'POST' && ex) {
					const s = sessions.get(ex[1]);
					if (!s) return apiError(res, 404, `No such checkout.session: '${ex[1]}'`);
					if (s.status !== 'open') {
						return apiError(
							res,
							400,
							'Only Checkout Sessions with a status of `open` can be expired.'
						);
					}
					s.status = 'expired';
					s.url = null;
					return json(res, 200, s);
				}
				const m = /^\/v1\/checkout\/sessions\/([\w-]+)$/.exec(url.pathname);
				if (req.method === 'GET' && m) {
					const s = sessions.get(m[1]);
					return s ? json(res, 200, s) : apiError(res, 404, `No such checkout.session: '${m[1]}'`);
				}
				return apiError(res, 404, `Unrecognized request URL (${req.method}: ${url.pathname}).`);
			}
			const pay = /^\/pay\/([\w-]+)$/.exec(url.pathname);
			if (pay) {
				const s = sessions.get(pay[1]);
				if (!s) {
					res.writeHead(404, { 'content-type': 'text/plain' });
					return res.end('No such payment.');
				}
				if (s.status === 'expired') {
					res.writeHead(410, { 'content-type': 'text/plain' });
					return res.end('This payment page has expired: nothing was charged.');
				}
				if (req.method === 'POST') {
					if (s.status !== 'complete') {
						s.status = 'complete';
						s.payment_status = 'paid';
						s.payment_intent = `pi_test_${randomBytes(12).toString('hex')}`;
						events.set(s.id, {
							id: `evt_test_${randomBytes(12).toString('hex')}`,
							object: 'event',
							api_version: '2026-01-01',
							created: Math.floor(Date.now() / 1000),
							livemode: false,
							type: 'checkout.session.completed',
							data: { object: { ...s } }
						});
					}
					// A repeat press re-sends the same event, as the real service retries deliveries.
					s.last_delivery_status = await deliver(events.get(s.id));
					res.writeHead(303, { location: s.success_url });
					return res.end();
				}
				const digits = new Intl.NumberFormat('en', {
					style: 'currency',
					currency: s.currency
				}).resolvedOptions().maximumFractionDigits;
				const amount = (s.amount_total / 10 ** digits).toFixed(digits);
				res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' });
				return res.end(`<!doctype html><html lang="en"><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Local test payment</title>
<body style="font-family: system-ui, sans-serif; max-width: 32rem; margin: 3rem auto; padding: 0 1rem">
<p style="background:#fff3cd;padding:.5rem .75rem;border-radius:.25rem">Local test payment provider: no money moves.</p>
<h1>${esc(s.description || 'Payment')}</h1>
<p>Amount: <strong>${esc(amount)} ${esc(s.currency.toUpperCase())}</strong> (${s.amount_total} minor units)</p>
<p>Status: ${esc(s.payment_status)}</p>
<form method="post"><button style="font-size:1.1rem;padding:.6rem 1.4rem">Pay now</button></form>
${s.cancel_url ? `<p><a href="${esc(s.cancel_url)}">Back</a></p>` : ''}
</body></html>`);
			}
			res.writeHead(404, { 'content-type': 'text/plain' });
			res.end('Not found');
		} catch (err) {
			console.error('[payments fake]', err);
			apiError(res, 500, 'The fake provider failed.');
		}
	});
	return new Promise((resolve, reject) => {
		server.once('error', reject);
		server.listen(port, HOST, () => resolve({ server, port: server.address().port, sessions }));
	});
}

export async function startSmtpSink({ port = 2525, dir }) {
	const { SMTPServer } = await import('smtp-server');
	mkdirSync(dir, { recursive: true });
	let count = 0;
	const server = new SMTPServer({
		secure: false,
		authOptional: true,
		disabledCommands: ['STARTTLS'],
		banner: 'Benchcall local mail sink: messages are kept here, never delivered',
		size: 25 * 1024 * 1024,
		onData(stream, session, callback) {
			const chunks = [];
			stream.on('data', (c) => chunks.push(c));
			stream.on('end', () => {
				const id = `${Date.now()}-${++count}`;
				writeFileSync(join(dir, `${id}.eml`), Buffer.concat(chunks));
				callback(null, `Kept by the local sink as ${id}`);
			});
		}
	});
	server.on('error', (err) => console.error('[smtp sink]', err.message));
	await new Promise((resolve, reject) => {
		server.server.once('error', reject);
		server.listen(port, HOST, resolve);
	});
	return { server, port: server.server.address().port };
}

/**
 * Starts whichever fakes the environment does not replace with a real service, and returns the
 * environment the app needs to use them. `ports` may be 0 for any free port (tests).
 */
export async function startFakes({
	appOrigin,
	dataDir,
	smtpPort,
	paymentsPort,
	env = process.env
}) {
	const out = {};
	const closers = [];
	if (!env.SMTP_URL) {
		const sink = await startSmtpSink({ port: smtpPort, dir: join(dataDir, 'mail') });
		out.SMTP_URL = `smtp://${HOST}:${sink.port}`;
		closers.push(() => sink.server.close());
		console.log(`  Local mail sink on ${HOST}:${sink.port} (copies in ${join(dataDir, 'mail')})`);
	}
	if (!env.STRIPE_SECRET_KEY) {
		const secretKey = 'sk_test_benchcall_local_fake';
		const webhookSecret = `whsec_${randomBytes(24).toString('hex')}`;
		const fake = await startPaymentsFake({
			port: paymentsPort,
			secretKey,
			webhookSecret,
			webhookUrl: `${appOrigin}/api/payments/webhook`
		});
		Object.assign(out, {
			STRIPE_SECRET_KEY: secretKey,
			STRIPE_WEBHOOK_SECRET: webhookSecret,
			STRIPE_API_HOST: HOST,
			STRIPE_API_PORT: String(fake.port),
			STRIPE_API_PROTOCOL: 'http'
		});
		closers.push(() => fake.server.close());
		console.log(`  Local payment provider on ${HOST}:${fake.port}`);
	}
	return { env: out, close: () => closers.forEach((c) => c()) };
}
