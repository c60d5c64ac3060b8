import type { z } from 'zod';
import { formatMoney, parseMoney } from '$lib/money';
import { failure, type Failure } from '$lib/result';
import { echoValues } from '$lib/schemas/form';
import {
	counterPaymentSchema,
	creditSchema,
	emailInvoiceSchema,
	invoiceIdSchema,
	labourModeSchema,
	lineIdSchema,
	manualLineSchema,
	pickPartSchema
} from '$lib/schemas/invoice';
import { requireRole } from '$lib/server/auth';
import { found, refuse } from '$lib/server/http';
import { readForm } from '$lib/server/request';
import { invoicePdf } from '$lib/server/invoice-pdf';
import { addManualLine, makeDraft, pickPart, removeLine } from '$lib/server/invoice-lines';
import {
	creditInvoice,
	findJobByNumber,
	getInvoice,
	issueInvoice,
	jobInvoices,
	priceList
} from '$lib/server/invoices';
import { recordPayment } from '$lib/server/payments';
import { mailFrom, sendMail } from '$lib/server/mail';
import { expireCheckout } from '$lib/server/payments';
import { getShop } from '$lib/server/shop';
import { workReport } from '$lib/server/work-report';
import type { Actions, PageServerLoad } from './$types';

function jobNumber(raw: string): number {
	return Number(found(/^\d{1,9}$/.test(raw) ? raw : null, 'No such job card.'));
}

async function jobOr404(shopId: string, raw: string) {
	return found(await findJobByNumber(shopId, jobNumber(raw)), 'No such job card in this shop.');
}

export const load: PageServerLoad = async ({ params }) => {
	const user = requireRole('service_writer', 'owner');
	const job = await jobOr404(user.shopId, params.number);
	const [invoices, parts, shop] = await Promise.all([
		jobInvoices(user.shopId, job.id),
		priceList(user.shopId),
		getShop(user.shopId)
	]);
	return { job, invoices, parts, shop: shop!, canDraft: job.state === 'ready_to_invoice' };
};

type Answer = { action: string; values?: Record<string, string> };

async function parse<S extends z.ZodType>(
	request: Request,
	schema: S,
	action: string
): Promise<{ parsed: z.infer<S>; form: FormData } | ReturnType<typeof refuse<Answer>>> {
	const form = await readForm(request);
	const r = schema.safeParse(Object.fromEntries(form));
	if (!r.success) return refuse(r.error, { action, values: echoValues(form) });
	return { parsed: r.data, form };
}

/** A refusal of `action`, answered with the status of its kind (a state refusal is a 409). */
const refused = (action: string, why: Failure, values?: Record<string, string>) =>
	refuse(why, { action, values });

/** The job has no draft to change: a refusal because of its state. */
const noDraft = (message: string) => failure('conflict', message);

/** The draft this job is working on, checked against the job so a foreign id is a 404. */
async function draftOf(shopId: string, jobId: string) {
	const all = await jobInvoices(shopId, jobId);
	return all.find((i) => i.status === 'draft') ?? null;
}

async function invoiceOfJob(shopId: string, jobId: string, invoiceId: string) {
	const inv = await getInvoice(shopId, invoiceId);
	return found(inv?.jobId === jobId ? inv : null, 'No such invoice on this job.');
}

export const actions = {
	draft: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const job = await jobOr404(user.shopId, params.number);
		const p = await parse(request, labourModeSchema, 'draft');
		if (!('parsed' in p)) return p;
		const r = await makeDraft(user.shopId, job.id, user.id, p.parsed.labourMode);
		if (!r.ok) return refused('draft', r);
		return { action: 'draft', done: 'Draft made from the job log.' };
	},

	addLine: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const job = await jobOr404(user.shopId, params.number);
		const p = await parse(request, manualLineSchema, 'addLine');
		if (!('parsed' in p)) return p;
		const draft = await draftOf(user.shopId, job.id);
		if (!draft) return refused('addLine', noDraft('Make a draft first.'));
		const price = parseMoney(p.parsed.unitPrice, draft.currency);
		if (!price.ok) {
			return refused('addLine', failure('invalid', price.error, 'unitPrice'), echoValues(p.form));
		}
		const r = await addManualLine(user.shopId, draft.id, {
			kind: p.parsed.kind,
			description: p.parsed.description,
			quantity: p.parsed.quantity,
			unitPriceMinor: price.minor
		});
		if (!r.ok) return refused('addLine', r, echoValues(p.form));
		return {
			action: 'addLine',
			done: `${p.parsed.kind === 'discount' ? 'Discount' : 'Line'} added.`
		};
	},

	removeLine: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const job = await jobOr404(user.shopId, params.number);
		const p = await parse(request, lineIdSchema, 'removeLine');
		if (!('parsed' in p)) return p;
		const draft = await draftOf(user.shopId, job.id);
		if (!draft) return refused('removeLine', noDraft('There is no draft to change.'));
		const r = await removeLine(user.shopId, draft.id, p.parsed.lineId);
		if (!r.ok) return refused('removeLine', r);
		return { action: 'removeLine', done: 'Line removed.' };
	},

	pick: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const job = await jobOr404(user.shopId, params.number);
		const p = await parse(request, pickPartSchema, 'pick');
		if (!('parsed' in p)) return p;
		const draft = await draftOf(user.shopId, job.id);
		if (!draft) return refused('pick', noDraft('There is no draft to change.'));
		const r = await pickPart(user.shopId, draft.id, p.parsed.lineId, p.parsed.partId);
		if (!r.ok) return refused('pick', r);
		return { action: 'pick', done: 'Part picked from the price list.' };
	},

	issue: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const job = await jobOr404(user.shopId, params.number);
		const p = await parse(request, invoiceIdSchema, 'issue');
		if (!('parsed' in p)) return p;
		await invoiceOfJob(user.shopId, job.id, p.parsed.invoiceId);
		const r = await issueInvoice(user.shopId, p.parsed.invoiceId, user.id);
		if (!r.ok) return refused('issue', r);
		return { action: 'issue', done: `Invoice ${r.number} issued. It can no longer change.` };
	},

	credit: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const job = await jobOr404(user.shopId, params.number);
		const p = await parse(request, creditSchema, 'credit');
		if (!('parsed' in p)) return p;
		await invoiceOfJob(user.shopId, job.id, p.parsed.invoiceId);
		const r = await creditInvoice(user.shopId, p.parsed.invoiceId, user.id, p.parsed.reason);
		if (!r.ok) return refused('credit', r, echoValues(p.form));
		// The customer's open checkout must not stay payable once the invoice is credited.
		const closed = await expireCheckout(r.checkoutSessionId);
		return {
			action: 'credit',
			done: closed
				? `Credit note ${r.number} issued.`
				: `Credit note ${r.number} issued. The payment provider could not be reached to close the customer’s payment page: a payment made there still shows here as a refund due.`
		};
	},

	payment: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const job = await jobOr404(user.shopId, params.number);
		const p = await parse(request, counterPaymentSchema, 'payment');
		if (!('parsed' in p)) return p;
		const inv = await invoiceOfJob(user.shopId, job.id, p.parsed.invoiceId);
		const amount = parseMoney(p.parsed.amount, inv.currency);
		if (!amount.ok || amount.minor <= 0) {
			const why = amount.ok ? 'The amount must be more than zero.' : amount.error;
			return refused('payment', failure('invalid', why, 'amount'), echoValues(p.form));
		}
		const r = await recordPayment(user.shopId, inv.id, {
			method: p.parsed.method,
			amountMinor: amount.minor,
			byUserId: user.id
		});
		if (!r.ok) return refused('payment', r, echoValues(p.form));
		return {
			action: 'payment',
			done: `${formatMoney(amount.minor, inv.currency, (await getShop(user.shopId))?.locale)} by ${p.parsed.method} recorded.${r.paid ? ' The invoice is paid.' : ''}`
		};
	},

	email: async ({ request, params, url }) => {
		const user = requireRole('service_writer', 'owner');
		const job = await jobOr404(user.shopId, params.number);
		const p = await parse(request, emailInvoiceSchema, 'email');
		if (!('parsed' in p)) return p;
		const inv = await invoiceOfJob(user.shopId, job.id, p.parsed.invoiceId);
		if (inv.status === 'draft') {
			return refused('email', failure('conflict', 'Issue the invoice before sending it.'));
		}
		const shop = (await getShop(user.shopId))!;
		const pdf = await invoicePdf({
			shop,
			job,
			invoice: inv,
			report: await workReport(user.shopId, job.id)
		});
		const what = inv.kind === 'credit_note' ? 'Credit note' : 'Invoice';
		const link = `${url.origin}/r/${inv.customerToken}`;
		const sent = await sendMail({
			shopId: user.shopId,
			invoiceId: inv.id,
			sentBy: user.id,
			from: mailFrom(shop.name),
			to: p.parsed.to,
			subject: `${what} ${inv.number} from ${shop.name} (job card ${job.number})`,
			text: [
				`Hello${job.customerName ? ` ${job.customerName}` : ''},`,
				'',
				`${what} ${inv.number} for job card ${job.number} (${[job.registration, job.make, job.model].filter(Boolean).join(' ')}) is attached, with the work report.`,
				`Total: ${formatMoney(inv.totalMinor, inv.currency, shop.locale)}.`,
				'',
				inv.kind === 'invoice' && inv.status === 'issued'
					? `See it and pay online: ${link}`
					: `See it online: ${link}`,
				'',
				shop.name
			].join('\n'),
			attachments: [
				{
					filename: `${what.toLowerCase().replace(' ', '-')}-${inv.number}.pdf`,
					content: pdf,
					contentType: 'application/pdf'
				}
			]
		});
		if (!sent.ok) return refused('email', sent, echoValues(p.form));
		return { action: 'email', done: sent.message };
	}
} satisfies Actions;
