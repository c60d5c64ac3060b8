// Security headers on what the server answers, the Content-Security-Policy against the one in
// svelte.config.js, and two things only a server of our own can show: that no password ever
// reaches its output, and that the session cookie is Secure when the app is served over https.
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { fileURLToPath } from 'node:url';
import { expect, test } from '@playwright/test';
import config from '../../svelte.config.js';
import { demo, demoPassword } from '../helpers/auth';
import { securityTargets } from './data';
import { port, send, sessionCookie, signInSession, type Answer } from './http';

type Directives = Map<string, string[]>;

function parseCsp(header: string): Directives {
	const out: Directives = new Map();
	for (const part of header.split(';')) {
		const [name, ...sources] = part.trim().split(/\s+/);
		if (name) out.set(name.toLowerCase(), sources);
	}
	return out;
}

/** svelte.config.js writes keywords bare ('self'); the header quotes them. */
const keywords = new Set([
	'self',
	'none',
	'unsafe-inline',
	'unsafe-eval',
	'wasm-unsafe-eval',
	'strict-dynamic',
	'unsafe-hashes',
	'report-sample'
]);
const quoted = (s: string) => (keywords.has(s) ? `'${s}'` : s);

function checkCsp(a: Answer, what: string) {
	const header = a.headers.get('content-security-policy');
	expect(header, `${what}: a CSP header (frame-ancestors only works as a header)`).toBeTruthy();
	const csp = parseCsp(header!);
	const configured = config.kit!.csp!.directives as Record<string, string[]>;
	for (const [name, sources] of Object.entries(configured)) {
		const sent = (csp.get(name) ?? []).filter((s) => !/^'(nonce|sha\d+)-/.test(s));
		expect(sent, `${what}: ${name} as in svelte.config.js`).toEqual(sources.map(quoted));
	}
	const script = csp.get('script-src') ?? [];
	// No inline-script holes: SvelteKit's own inline script runs by its nonce, nothing else.
	for (const hole of [
		"'unsafe-inline'",
		"'unsafe-eval'",
		"'unsafe-hashes'",
		'*',
		'data:',
		'http:',
		'https:',
		'blob:'
	]) {
		expect(script, `${what}: script-src must not allow ${hole}`).not.toContain(hole);
	}
	const nonces = script.filter((s) => s.startsWith("'nonce-")).map((s) => s.slice(7, -1));
	expect(nonces, `${what}: one nonce for SvelteKit's inline script`).toHaveLength(1);
	expect(csp.get('frame-ancestors')).toEqual(["'none'"]);
	expect(csp.get('object-src')).toEqual(["'none'"]);
	expect(csp.get('base-uri')).toEqual(["'self'"]);
	// Every inline script in the page carries that nonce; no inline event handler attributes.
	const inline = [...a.text.matchAll(/<script(?![^>]*\ssrc=)([^>]*)>/g)].map((m) => m[1]);
	expect(inline.length, `${what}: SvelteKit's start script is inline`).toBeGreaterThan(0);
	for (const attrs of inline) expect(attrs, what).toContain(`nonce="${nonces[0]}"`);
	expect(a.text, what).not.toMatch(/<[a-z][^>]*\son[a-z]+\s*=/i);
	return nonces[0];
}

function checkBasics(a: Answer, what: string) {
	expect(a.headers.get('x-content-type-options'), what).toBe('nosniff');
	expect(a.headers.get('referrer-policy'), what).toBe('same-origin');
	expect(a.headers.get('x-frame-options'), what).toBe('DENY');
}

test('every kind of HTML page carries the CSP of svelte.config.js, with a fresh nonce and no inline holes', async () => {
	const { kettle } = await securityTargets();
	const owner = await signInSession(demo.owner);
	const tech = await signInSession(demo.tomasz);
	const pages: [string, string | null, number][] = [
		['/sign-in', null, 200],
		['/notice', null, 200],
		['/no-such-page', null, 404],
		[`/r/${kettle.token}`, null, 200],
		['/jobs', owner, 200],
		[`/jobs/${kettle.number}`, owner, 200],
		['/bench', tech, 200],
		['/shop', tech, 403]
	];
	const nonces = new Set<string>();
	for (const [path, session, status] of pages) {
		const a = await send(path, { session, headers: { accept: 'text/html' } });
		expect(a.status, path).toBe(status);
		nonces.add(checkCsp(a, path));
		checkBasics(a, path);
	}
	expect(nonces.size, 'a new nonce for every page').toBe(pages.length);
});

test('nosniff, Referrer-Policy and X-Frame-Options on API answers, redirects and errors too', async () => {
	const { kettle } = await securityTargets();
	const owner = await signInSession(demo.owner);
	const answers: [string, string | null, number][] = [
		['/api/staff', null, 401],
		['/api/staff', owner, 200],
		['/', owner, 303],
		['/jobs', null, 303],
		[`/api/jobs/${kettle.jobId}/entries`, owner, 200],
		['/api/jobs/00000000-0000-0000-0000-000000000000/steps', owner, 404],
		[`/api/photos/${kettle.photoId}`, owner, 200],
		[`/jobs/${kettle.number}/invoice/${kettle.invoiceId}/csv`, owner, 200],
		[`/r/${kettle.token}/pdf`, null, 200],
		['/jobs?q=%00', owner, 400]
	];
	for (const [path, session, status] of answers) {
		const a = await send(path, { session });
		expect(a.status, path).toBe(status);
		checkBasics(a, path);
	}
});

test('signed-in pages and JSON are private and never stored; the session cookie lives two days', async () => {
	const { kettle } = await securityTargets();
	const owner = await signInSession(demo.owner);
	for (const [path, accept] of [
		['/jobs', 'text/html'],
		[`/jobs/${kettle.number}/invoice`, 'text/html'],
		['/api/staff', 'application/json'],
		[`/api/jobs/${kettle.jobId}/entries`, 'application/json']
	]) {
		const a = await send(path, { session: owner, headers: { accept } });
		expect(a.status, path).toBe(200);
		expect(a.headers.get('cache-control'), path).toBe('private, no-store');
	}
	// 13 MB of JSON to the entries API: over the server's body limit, so 413, not 400 or 500.
	const big = await send(`/api/jobs/${kettle.jobId}/entries`, {
		session: owner,
		body: { json: { id: crypto.randomUUID(), text: 'x'.repeat(13 * 1024 * 1024), source: 'typed' } }
	});
	expect(big.status).toBe(413);
	const res = await send('/sign-in', {
		body: { form: { email: demo.owner, password: demoPassword } }
	});
	const cookie = sessionCookie(res.headers) ?? '';
	// The server session lasts 2 days (lucia's sessionExpiresIn): so does the cookie.
	expect(cookie).toMatch(/Max-Age=172800\b/);
});

test("the customer's page data carries no internal ids", async () => {
	const { kettle } = await securityTargets();
	const a = await send(`/r/${kettle.token}/__data.json`);
	expect(a.status).toBe(200);
	for (const leak of [
		kettle.shopId,
		kettle.invoiceId,
		kettle.jobId,
		'checkoutSessionId',
		'labourRateMinor',
		'createdBy',
		'issuedBy'
	]) {
		expect(a.text, leak).not.toContain(leak);
	}
});

test.describe('a server of our own, over https as far as it knows', () => {
	const port2 = port + 20;
	const base = `http://127.0.0.1:${port2}`;
	// Behind a TLS-terminating proxy, ORIGIN is the https address the browser sees.
	const httpsOrigin = `https://127.0.0.1:${port2}`;
	let server: ChildProcess | null = null;
	let output = '';

	test.beforeAll(async () => {
		const root = fileURLToPath(new URL('../..', import.meta.url));
		server = spawn(process.execPath, ['build'], {
			cwd: root,
			env: {
				...process.env,
				HOST: '127.0.0.1',
				PORT: String(port2),
				ORIGIN: httpsOrigin,
				DATABASE_URL: process.env.BENCHCALL_TEST_DATABASE_URL ?? ''
			},
			stdio: ['ignore', 'pipe', 'pipe']
		});
		server.stdout!.on('data', (d) => (output += d));
		server.stderr!.on('data', (d) => (output += d));
		for (let i = 0; i < 100; i++) {
			try {
				if ((await fetch(`${base}/sign-in`)).ok) return;
			} catch {
				// not up yet
			}
			await new Promise((r) => setTimeout(r, 200));
		}
		throw new Error(`the server did not start on ${base}`);
	});

	test.afterAll(async () => {
		if (!server || server.exitCode !== null) return;
		const exited = new Promise((r) => server!.once('exit', r));
		server.kill('SIGTERM');
		await exited;
	});

	const post = (path: string, form: Record<string, string>, session?: string) =>
		send(path, {
			base,
			origin: httpsOrigin,
			session,
			body: { form },
			headers: { accept: 'text/html' }
		});

	test('the session cookie is Secure, and no password reaches the server’s output', async () => {
		const wrong = `wrong-${randomBytes(8).toString('hex')}`;
		const long = `long-${randomBytes(8).toString('hex')}`.padEnd(300, 'x');
		const fresh = `fresh-${randomBytes(8).toString('hex')}`;

		// A failed sign-in (an unknown e-mail, so no demo account is slowed down), one refused by
		// the form's rules, one the form cannot read, and a good one.
		const failed = await post('/sign-in', {
			email: `nobody-${randomBytes(4).toString('hex')}@kettlestreet.test`,
			password: wrong
		});
		expect(failed.status).toBe(400);
		expect(failed.text).not.toContain(wrong);
		const tooLong = await post('/sign-in', { email: demo.ruth, password: long });
		expect(tooLong.status).toBe(400);
		expect(tooLong.text).not.toContain(long);
		const garbled = await send('/sign-in', {
			base,
			origin: httpsOrigin,
			body: {
				raw: `--x\r\nContent-Disposition: form-data; name="password"\r\n\r\n${wrong}`,
				contentType: 'multipart/form-data; boundary=x'
			}
		});
		expect(garbled.status).toBe(400);

		const ok = await post('/sign-in', { email: demo.owner, password: demoPassword });
		expect(ok.status).toBe(303);
		const cookie = sessionCookie(ok.headers)!;
		expect(cookie.split(';').map((a) => a.trim().toLowerCase())).toContain('secure');
		const session = cookie.split(';')[0].split('=')[1];

		// A password set by the owner for a new account, once refused (too short) and once kept.
		const email = `logcheck-${randomBytes(4).toString('hex')}@kettlestreet.test`;
		const short = await post(
			'/shop?/create',
			{ name: 'Log Check', email, role: 'technician', password: 'short-1' },
			session
		);
		expect(short.status).toBe(400);
		expect(short.text).not.toContain('short-1');
		const made = await post(
			'/shop?/create',
			{ name: 'Log Check', email, role: 'technician', password: fresh },
			session
		);
		expect(made.status).toBe(200);
		await post('/sign-in', { email, password: fresh });

		// Stop the server and read everything it wrote: once its pipes close, its output is complete.
		const closed = new Promise((r) => server!.once('close', r));
		server!.kill('SIGTERM');
		await closed;
		expect(output, 'the server’s output was captured').toContain('Listening on');
		for (const secret of [wrong, long, fresh, demoPassword, 'short-1']) {
			expect(output.includes(secret), `the output holds a password: ${secret.slice(0, 12)}…`).toBe(
				false
			);
		}
	});
});
