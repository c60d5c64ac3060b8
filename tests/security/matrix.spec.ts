// The role × route matrix: every page, form action and endpoint method under src/routes, asked
// by each role of the demo shop, by a signed-out visitor and by the owner of the second shop,
// against the built server. Expected answers live in ./rules.ts; no answer may be a 500, and no
// body may show the other shop's data (its customers, staff, job numbers, marked rows).
import { expect, test } from '@playwright/test';
import type { Role } from '../../src/lib/auth/roles';
import { demo } from '../helpers/auth';
import { leaksOf, securityTargets, type Target } from './data';
import { send, signInSession, type Answer } from './http';
import { pathOf, routeCases, type RouteCase } from './routes';
import { paramsFor, rules, type Expected, type Principal, type Rule } from './rules';

const accounts: Record<Exclude<Principal, 'anon'>, string> = {
	owner: demo.owner,
	service_writer: demo.writer,
	foreman: demo.foreman,
	technician: demo.tomasz,
	otherShop: demo.otherOwner
};

const cases = routeCases();

test('every route under src/routes has a rule in tests/security/rules.ts, and every rule a route', () => {
	const keys = cases.map((c) => c.key);
	expect(keys.length).toBeGreaterThan(50);
	const missing = keys.filter((k) => !(k in rules));
	expect(missing, 'routes without a rule: add a row to tests/security/rules.ts').toEqual([]);
	const stale = Object.keys(rules).filter((k) => !keys.includes(k));
	expect(stale, 'rules for routes that no longer exist').toEqual([]);
});

function mismatch(expected: Expected, a: Answer): string | null {
	if (a.status >= 500) return `answered ${a.status}`;
	if (expected === 'signin') {
		return a.status === 303 && a.location?.startsWith('/sign-in?next=')
			? null
			: `expected 303 → /sign-in?next=…, got ${a.status} ${a.location ?? ''}`;
	}
	if (a.status === expected) return null;
	return `expected ${expected}, got ${a.status}${a.location ? ` → ${a.location}` : ''}`;
}

/**
 * A form action asked as the app's enhanced forms ask (Accept: application/json), so that the
 * action's own answer is seen, not the page load that a plain form post renders after it: a
 * failure's status, a redirect's status and location, or the error's HTTP status.
 */
function actionAnswer(a: Answer): Answer {
	if (!a.contentType.startsWith('application/json')) return a;
	const r = JSON.parse(a.text) as { type: string; status?: number; location?: string };
	if (r.type === 'failure' || r.type === 'success') return { ...a, status: r.status ?? a.status };
	if (r.type === 'redirect') return { ...a, status: r.status ?? 303, location: r.location ?? null };
	return a;
}

/** One request of the matrix: the route with `params`, as `session`, with `body`. */
async function ask(
	c: RouteCase,
	t: Target,
	session: string | null,
	body: Rule['ownBody'],
	params = paramsFor(c.routeId, t)
) {
	const path = pathOf(c.routeId, params);
	const url = c.kind === 'action' && c.action !== 'default' ? `${path}?/${c.action}` : path;
	const answer = await send(url, {
		method: c.method,
		session,
		// Form actions get a form even when empty (no body at all is a 415 from SvelteKit).
		body: body?.(t) ?? (c.kind === 'action' ? { form: {} } : undefined),
		headers: { accept: c.kind === 'action' ? 'application/json' : 'text/html,*/*' }
	});
	return { url, answer: c.kind === 'action' ? actionAnswer(answer) : answer };
}

/** Cases in order, the ones that end the session last. */
const ordered = [...cases].sort(
	(a, b) => Number(!!rules[a.key]?.endsSession) - Number(!!rules[b.key]?.endsSession)
);

const principals: Principal[] = [
	'anon',
	'owner',
	'service_writer',
	'foreman',
	'technician',
	'otherShop'
];

for (const who of principals) {
	test(`matrix: ${who} on every route`, async () => {
		test.setTimeout(120_000);
		const { kettle, harbour } = await securityTargets();
		const session = who === 'anon' ? null : await signInSession(accounts[who]);
		// Everyone asks for the first shop's resources; the other shop's owner must not get them.
		const foreign = who === 'otherShop';
		const mustNotShow = foreign ? kettle : harbour;
		const problems: string[] = [];
		for (const c of ordered) {
			const rule = rules[c.key];
			if (!rule) continue; // reported by the coverage test above
			const body = foreign ? (rule.foreignBody ?? rule.ownBody) : rule.ownBody;
			const { url, answer } = await ask(c, kettle, session, body);
			const wrong = mismatch(rule[who], answer);
			if (wrong) problems.push(`${c.key} (${c.method} ${url}): ${wrong}`);
			const leaks = foreign && rule.public ? [] : leaksOf(mustNotShow, answer.text);
			if (leaks.length) problems.push(`${c.key}: shows the other shop's ${leaks.join(', ')}`);
		}
		expect(problems, `${who}: answers that differ from tests/security/rules.ts`).toEqual([]);
		if (session) {
			// The matrix ended with a sign-out: that session opens nothing now.
			expect((await send('/api/staff', { session })).status).toBe(401);
		}
	});
}

test('matrix: the first shop’s owner on the second shop’s ids', async () => {
	test.setTimeout(120_000);
	const { harbour } = await securityTargets();
	const session = await signInSession(demo.owner);
	const problems: string[] = [];
	for (const c of ordered) {
		const rule = rules[c.key];
		if (!rule || !c.routeId.includes('[') || rule.endsSession) continue;
		const { url, answer } = await ask(c, harbour, session, rule.foreignBody ?? rule.ownBody);
		const wrong = mismatch(rule.otherShop, answer);
		if (wrong) problems.push(`${c.key} (${c.method} ${url}): ${wrong}`);
		const leaks = rule.public ? [] : leaksOf(harbour, answer.text);
		if (leaks.length) problems.push(`${c.key}: shows the other shop's ${leaks.join(', ')}`);
	}
	expect(problems).toEqual([]);
});

test('a job number both shops use opens each shop’s own card', async () => {
	const { kettle, harbour } = await securityTargets();
	// Job numbers count per shop: the demo shop's 1042 and a 1042 of the second shop.
	const { db } = await import('../helpers/bench-db');
	await db()`
		insert into job (shop_id, number, concern)
		values (${harbour.shopId}, 1042, 'SECMARK-HARBOUR twin of 1042')
		on conflict do nothing`;
	const pairs: [Role | 'otherShop', Target, Target][] = [
		['owner', kettle, harbour],
		['otherShop', harbour, kettle]
	];
	for (const [who, own, other] of pairs) {
		const session = await signInSession(accounts[who]);
		for (const path of ['/jobs/1042', '/jobs/1042/invoice', '/bench?job=1042']) {
			const a = await send(path, { session });
			expect(a.status, `${who} ${path}`).toBe(200);
			expect(leaksOf(other, a.text), `${who} ${path}`).toEqual([]);
			if (path === '/jobs/1042')
				expect(a.text).toContain(own === harbour ? 'twin of 1042' : 'Samir Oduya');
		}
	}
});

test('malformed and unknown ids in every dynamic segment answer 404 (a NUL 400), never 500', async () => {
	test.setTimeout(120_000);
	const { kettle } = await securityTargets();
	const session = await signInSession(demo.owner);
	const bad = [
		'not-an-id',
		'-'.repeat(36),
		'00000000-0000-0000-0000-000000000000',
		'9'.repeat(12),
		"1' or '1'='1",
		'\u0000',
		'é'
	];
	const problems: string[] = [];
	for (const c of ordered) {
		const rule = rules[c.key];
		const names = [...c.routeId.matchAll(/\[(\w+)\]/g)].map((m) => m[1]);
		if (!rule || names.length === 0 || rule.endsSession) continue;
		for (const name of names) {
			for (const value of bad) {
				const params = { ...paramsFor(c.routeId, kettle), [name]: value };
				const body = rule.foreignBody ?? rule.ownBody;
				const { url, answer } = await ask(c, kettle, session, body, params);
				// A NUL never reaches a route: the address itself is refused (src/hooks.server.ts).
				const expected = value.includes('\u0000') ? 400 : 404;
				if (answer.status !== expected) {
					problems.push(`${c.key} [${name}]=${JSON.stringify(value)} (${url}): ${answer.status}`);
				}
			}
		}
	}
	expect(problems).toEqual([]);
});
