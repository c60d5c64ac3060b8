// Who may do what: the expected answer of every page, form action and endpoint method for each
// role, a signed-out visitor and a user of another shop. tests/security/matrix.spec.ts walks
// src/routes and runs every route against every column; a route without a row here fails it.
// Adding a route means adding its row.
//
// Answers: a status, or 'signin' (303 to /sign-in?next=… : pages and form actions send a
// signed-out visitor there; /api/* answers 401). Roles that pass the guard send a body that is
// not valid (`ownBody`, by default none), so the matrix changes nothing: 400 means "let in,
// body refused". The other shop's user (the owner of Harbour Lane, who passes every role
// guard) asks for the first shop's ids with a valid body (`foreignBody`): only the shop check
// stands between that request and a change, so it must answer 404 (or, for routes without an
// id, act on their own shop only — and never show the first shop's data).
import { randomUUID } from 'node:crypto';
import type { Role } from '../../src/lib/auth/roles';
import type { Target } from './data';
import { tinyPng } from './data';
import type { Body } from './http';

export type Expected = number | 'signin';
export type Principal = 'anon' | Role | 'otherShop';

export interface Rule {
	anon: Expected;
	owner: Expected;
	service_writer: Expected;
	foreman: Expected;
	technician: Expected;
	/** The other shop's owner, with the first shop's ids (and the reverse). */
	otherShop: Expected;
	/** Public by design (the customer's token link): any visitor sees the invoice's shop. */
	public?: true;
	/** Sent by the roles of the shop: refused by validation, so nothing changes. */
	ownBody?: (t: Target) => Body;
	/** Sent across shops: valid, so only the shop check refuses it. */
	foreignBody?: (t: Target) => Body;
	/** Ends the session it is sent with: the matrix sends it last. */
	endsSession?: true;
}

type Extra = Pick<Rule, 'public' | 'ownBody' | 'foreignBody' | 'endsSession'>;

/** One row: signed out, owner, service writer, foreman, technician, other shop. */
function r(
	anon: Expected,
	owner: Expected,
	service_writer: Expected,
	foreman: Expected,
	technician: Expected,
	otherShop: Expected,
	extra: Extra = {}
): Rule {
	return { anon, owner, service_writer, foreman, technician, otherShop, ...extra };
}

const form = (f: Record<string, string>) => (): Body => ({ form: f });
const json = (j: unknown) => (): Body => ({ json: j });
const photo = (): Body => {
	const fd = new FormData();
	fd.append('photo', new Blob([tinyPng], { type: 'image/png' }), 'photo.png');
	return { multipart: fd };
};
const S = 'signin' as const;

export const rules: Record<string, Rule> = {
	// ——— pages ———
	'GET /': r(303, 303, 303, 303, 303, 303),
	'GET /(auth)/sign-in': r(200, 303, 303, 303, 303, 303),
	'GET /notice': r(200, 200, 200, 200, 200, 200),
	'GET /sign-out': r(303, 303, 303, 303, 303, 303),
	'GET /(app)/bench': r(S, 200, 403, 200, 200, 200),
	'GET /(app)/floor': r(S, 200, 403, 200, 403, 200),
	'GET /(app)/floor/drift': r(S, 200, 403, 200, 403, 200),
	'GET /(app)/floor/jobs/[jobId]': r(S, 200, 403, 200, 403, 404),
	'GET /(app)/jobs': r(S, 200, 200, 200, 403, 200),
	'GET /(app)/jobs/new': r(S, 200, 200, 403, 403, 200),
	'GET /(app)/jobs/[number]': r(S, 200, 200, 200, 403, 404),
	'GET /(app)/jobs/[number]/invoice': r(S, 200, 200, 403, 403, 404),
	'GET /(app)/jobs/[number]/invoice/[invoiceId]/csv': r(S, 200, 200, 403, 403, 404),
	'GET /(app)/jobs/[number]/invoice/[invoiceId]/pdf': r(S, 200, 200, 403, 403, 404),
	'GET /(app)/jobs/[number]/evidence/pdf': r(S, 200, 200, 200, 403, 404),
	'GET /(app)/jobs/[number]/evidence/json': r(S, 200, 200, 200, 403, 404),
	'GET /(app)/vehicles': r(S, 200, 200, 200, 403, 200),
	'GET /(app)/vehicles/[id]': r(S, 200, 200, 200, 403, 404),
	'GET /(app)/customers/[id]': r(S, 200, 200, 200, 403, 404),
	'GET /(app)/procedures': r(S, 200, 200, 200, 200, 200),
	'GET /(app)/procedures/[id]': r(S, 200, 200, 200, 200, 404),
	'GET /(app)/procedures/import': r(S, 200, 403, 200, 403, 200),
	'GET /(app)/shop': r(S, 200, 403, 403, 403, 200),
	'GET /(app)/shop/settings': r(S, 200, 403, 403, 403, 200),
	'GET /(app)/shop/outbox': r(S, 200, 200, 403, 403, 200),
	'GET /(app)/shop/log-check': r(S, 200, 403, 403, 403, 200),
	'GET /(app)/shop/tools/[toolId]': r(S, 200, 403, 200, 403, 404),
	'GET /(app)/shop/outbox/[id]': r(S, 200, 200, 403, 403, 404),
	'GET /(app)/shop/outbox/[id]/attachments/[index]': r(S, 200, 200, 403, 403, 404),
	// The customer's private page: no sign-in, the token is the key.
	'GET /r/[token]': r(200, 200, 200, 200, 200, 200, { public: true }),
	'GET /r/[token]/pay': r(303, 303, 303, 303, 303, 303, { public: true }),
	'GET /r/[token]/pdf': r(200, 200, 200, 200, 200, 200, { public: true }),

	// ——— form actions ———
	'POST /(auth)/sign-in?/default': r(400, 400, 400, 400, 400, 400),
	'POST /sign-out?/default': r(303, 303, 303, 303, 303, 303, { endsSession: true }),
	'POST /(app)/jobs/new?/default': r(S, 400, 400, 403, 403, 404, {
		// Intake with the other shop's motorcycle: not in this shop, 404 as any other shop's id.
		foreignBody: (t) => ({
			form: { pick: `v:${t.vehicleId}`, concern: 'Security check', odometer: '100' }
		})
	}),
	'POST /(app)/vehicles/[id]?/remind': r(S, 400, 400, 403, 403, 404, {
		foreignBody: form({ to: 'customer@example.test' })
	}),
	'POST /(app)/jobs/[number]?/photo': r(S, 400, 400, 403, 403, 404, { foreignBody: photo }),
	'POST /(app)/jobs/[number]?/state': r(S, 400, 400, 403, 403, 404, {
		foreignBody: form({ to: 'on_hold', reason: 'Security check' })
	}),
	'POST /(app)/jobs/[number]?/assign': r(S, 400, 400, 403, 403, 404, {
		// An empty form is a valid "unassign": send a bad id instead.
		ownBody: form({ technicianId: 'not-an-id' }),
		foreignBody: (t) => ({ form: { technicianId: t.userId, bay: '' } })
	}),
	'POST /(app)/jobs/[number]?/extra': r(S, 400, 400, 403, 403, 404, {
		foreignBody: (t) => ({
			form: {
				procedureId: t.procedureId,
				description: 'Security check',
				approvedBy: 'Nobody',
				channel: 'phone',
				approvedAt: new Date(Date.now() - 60_000).toISOString()
			}
		})
	}),
	'POST /(app)/jobs/[number]/invoice?/draft': r(S, 400, 400, 403, 403, 404, {
		foreignBody: form({ labourMode: 'flat_rate' })
	}),
	'POST /(app)/jobs/[number]/invoice?/addLine': r(S, 400, 400, 403, 403, 404, {
		foreignBody: form({ kind: 'sundry', description: 'x', quantity: '1', unitPrice: '1.00' })
	}),
	'POST /(app)/jobs/[number]/invoice?/removeLine': r(S, 400, 400, 403, 403, 404, {
		foreignBody: () => ({ form: { lineId: randomUUID() } })
	}),
	'POST /(app)/jobs/[number]/invoice?/pick': r(S, 400, 400, 403, 403, 404, {
		foreignBody: (t) => ({ form: { lineId: randomUUID(), partId: t.partId } })
	}),
	'POST /(app)/jobs/[number]/invoice?/issue': r(S, 400, 400, 403, 403, 404, {
		foreignBody: (t) => ({ form: { invoiceId: t.invoiceId } })
	}),
	'POST /(app)/jobs/[number]/invoice?/credit': r(S, 400, 400, 403, 403, 404, {
		foreignBody: (t) => ({ form: { invoiceId: t.invoiceId, reason: 'Security check' } })
	}),
	'POST /(app)/jobs/[number]/invoice?/payment': r(S, 400, 400, 403, 403, 404, {
		foreignBody: (t) => ({ form: { invoiceId: t.invoiceId, method: 'cash', amount: '1.00' } })
	}),
	'POST /(app)/jobs/[number]/invoice?/email': r(S, 400, 400, 403, 403, 404, {
		foreignBody: (t) => ({ form: { invoiceId: t.invoiceId, to: 'someone@example.test' } })
	}),
	'POST /(app)/procedures?/create': r(S, 400, 403, 400, 403, 400),
	'POST /(app)/procedures?/duplicate': r(S, 400, 403, 400, 403, 404, {
		foreignBody: (t) => ({ form: { id: t.procedureId } })
	}),
	'POST /(app)/procedures?/archive': r(S, 400, 403, 400, 403, 404, {
		foreignBody: (t) => ({ form: { id: t.procedureId } })
	}),
	'POST /(app)/procedures?/restore': r(S, 400, 403, 400, 403, 404, {
		foreignBody: (t) => ({ form: { id: t.procedureId } })
	}),
	'POST /(app)/procedures/[id]?/details': r(S, 400, 403, 400, 403, 404, {
		foreignBody: form({ name: 'Security check', appliesTo: '', flatRateHours: '1' })
	}),
	'POST /(app)/procedures/[id]?/step': r(S, 400, 403, 400, 403, 404, {
		foreignBody: form({ stepId: '', label: 'Security check' })
	}),
	'POST /(app)/procedures/[id]?/deleteStep': r(S, 400, 403, 400, 403, 404, {
		foreignBody: (t) => ({ form: { stepId: t.stepId } })
	}),
	'POST /(app)/procedures/[id]?/move': r(S, 400, 403, 400, 403, 404, {
		foreignBody: (t) => ({ form: { stepId: t.stepId, direction: 'up' } })
	}),
	'POST /(app)/procedures/import?/preview': r(S, 400, 403, 400, 403, 400),
	'POST /(app)/procedures/import?/save': r(S, 400, 403, 400, 403, 400),
	'POST /(app)/shop?/create': r(S, 400, 403, 403, 403, 400),
	'POST /(app)/shop?/role': r(S, 400, 403, 403, 403, 404, {
		foreignBody: (t) => ({ form: { userId: t.userId, role: 'owner' } })
	}),
	'POST /(app)/shop?/deactivate': r(S, 400, 403, 403, 403, 404, {
		foreignBody: (t) => ({ form: { userId: t.userId } })
	}),
	'POST /(app)/shop?/reactivate': r(S, 400, 403, 403, 403, 404, {
		foreignBody: (t) => ({ form: { userId: t.userId } })
	}),
	'POST /(app)/shop?/password': r(S, 400, 403, 403, 403, 404, {
		foreignBody: (t) => ({ form: { userId: t.userId, password: 'security-check-2026' } })
	}),
	'POST /(app)/shop/settings?/settings': r(S, 400, 403, 403, 403, 400),
	'POST /(app)/shop/settings?/part': r(S, 400, 403, 403, 403, 404, {
		foreignBody: (t) => ({
			form: { partId: t.partId, code: 'SEC-1', description: 'x', unit: 'each', priceMinor: '1' }
		})
	}),
	'POST /(app)/shop/settings?/checkItem': r(S, 400, 403, 403, 403, 404, {
		foreignBody: (t) => ({ form: { itemId: t.inspectionItemId, label: 'SEC line' } })
	}),
	'POST /(app)/shop/settings?/checkItemChange': r(S, 400, 403, 403, 403, 404, {
		foreignBody: (t) => ({ form: { itemId: t.inspectionItemId, change: 'remove' } })
	}),
	'POST /(app)/shop/settings?/tool': r(S, 400, 403, 403, 403, 404, {
		foreignBody: (t) => ({
			form: {
				toolId: t.toolId,
				identifier: 'SEC-TW',
				kind: 'Type II class A click',
				rangeMin: '5',
				rangeMax: '60',
				unit: 'N.m'
			}
		})
	}),

	'POST /(app)/shop/tools/[toolId]?/check': r(S, 400, 403, 400, 403, 404, {
		foreignBody: form({
			checkedOn: '2026-12-01',
			checkedBy: 'Security check',
			set_0: '20',
			r_0_0: '20.1'
		})
	}),

	// ——— endpoints ———
	'GET /api/floor/board': r(401, 200, 403, 200, 403, 200),
	'GET /api/floor/log': r(401, 200, 403, 200, 403, 200),
	'GET /api/floor/stream': r(401, 200, 403, 200, 403, 200),
	'GET /api/floor/jobs/[jobId]/inspection': r(401, 200, 403, 200, 403, 404),
	'POST /api/floor/jobs/[jobId]/inspection': r(401, 400, 403, 400, 403, 404, {
		foreignBody: (t) => ({ json: { itemId: t.inspectionItemId, ticked: true } })
	}),
	// No body: the open job is not signed off, so a foreman or owner is refused with 409.
	'POST /api/floor/jobs/[jobId]/ready': r(401, 409, 403, 409, 403, 404),
	'POST /api/floor/jobs/[jobId]/sign-off': r(401, 409, 403, 409, 403, 404),
	'POST /api/floor/entries/[entryId]/accept': r(401, 400, 403, 400, 403, 404, {
		foreignBody: json({ reason: 'Security check' })
	}),
	'POST /api/floor/entries/[entryId]/redo': r(401, 400, 403, 400, 403, 404, {
		foreignBody: json({ note: 'Security check' })
	}),
	'GET /api/jobs/[jobId]/entries': r(401, 200, 200, 200, 200, 404),
	'POST /api/jobs/[jobId]/entries': r(401, 400, 403, 400, 400, 404, {
		foreignBody: () => ({
			json: { id: randomUUID(), text: 'note security check', source: 'typed' }
		})
	}),
	'POST /api/jobs/[jobId]/entries/[entryId]/photos': r(401, 400, 403, 400, 400, 404, {
		foreignBody: photo
	}),
	'POST /api/jobs/[jobId]/final-inspection': r(401, 400, 403, 400, 400, 404, {
		foreignBody: json({ reason: 'Security check' })
	}),
	// No ?step= in the matrix: let in, query refused (tests/bench.spec.ts reads a real history).
	'GET /api/jobs/[jobId]/history': r(401, 400, 403, 400, 400, 404),
	'GET /api/jobs/[jobId]/steps': r(401, 200, 200, 200, 200, 404),
	'GET /api/jobs/[jobId]/stream': r(401, 200, 200, 200, 200, 404),
	'GET /api/photos/[photoId]': r(401, 200, 200, 200, 200, 404),
	'GET /api/procedures/export': r(401, 200, 200, 200, 200, 200),
	'GET /api/procedures/schema': r(401, 200, 200, 200, 200, 200),
	'GET /api/staff': r(401, 200, 403, 403, 403, 200),
	// The payment provider's webhook: no sign-in; its signature is the guard.
	'POST /api/payments/webhook': r(400, 400, 400, 400, 400, 400, { public: true })
};

/**
 * The value of every dynamic segment, from one shop's target. `[id]` names a procedure under
 * /procedures and a mail under /shop/outbox.
 */
export function paramsFor(routeId: string, t: Target): Record<string, string> {
	return {
		jobId: t.jobId,
		number: t.number,
		invoiceId: t.invoiceId,
		index: '0',
		token: t.token,
		entryId: t.entryId,
		photoId: t.photoId,
		toolId: t.toolId,
		...(routeId.includes('/procedures/[id]') ? { id: t.procedureId } : {}),
		...(routeId.includes('/outbox/[id]') ? { id: t.outboxId } : {}),
		...(routeId.includes('/vehicles/[id]') ? { id: t.vehicleId } : {}),
		...(routeId.includes('/customers/[id]') ? { id: t.customerId } : {})
	};
}
