import { error, fail } from '@sveltejs/kit';
import type { z } from 'zod';
import { formatMoney, parseMoney } from '$lib/money';
import { echoValues, fieldErrors, formError } from '$lib/schemas/form';
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
	if (!/^\d{1,9}$/.test(raw)) error(404, 'No such job card.');
	return Number(raw);
}

async function jobOr404(shopId: string, raw: string) {
	const job = await findJobByNumber(shopId, jobNumber(raw));
	if (!job) error(404, 'No such job card in this shop.');
	return job;
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

type Failure = { action: string; errors: Record<string, string>; values?: Record<string, string> };

async function parse<S extends z.ZodType>(
	request: Request,
	schema: S,
	action: string
): Promise<{ parsed: z.infer<S>; form: FormData } | ReturnType<typeof fail<Failure>>> {
	const form = await readForm(request);
	const r = schema.safeParse(Object.fromEntries(form));
	if (!r.success) {
		return fail(400, { action, errors: fieldErrors(r.error), values: echoValues(form) });
	}
	return { parsed: r.data, form };
}

const refused = (action: string, message: string, values?: Record<string, string>) =>
	fail(400, { action, errors: formError(message), values });

/** The draft this job is working on, checked against the job so a foreign id is a 404. */
async function draftOf(shopId: string, jobId: string) {
	const all = await jobInvoices(shopId, jobId);
	return all.find((i) => i.status === 'draft') ?? null;
}

async function invoiceOfJob(shopId: string, jobId: string, invoiceId: string) {
	const inv = await getInvoice(shopId, invoiceId);
	if (!inv || inv.jobId !== jobId) error(404, 'No such invoice on this job.');
	return inv;
}

export const actions = {
	draft: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const job = await jobOr404(user.shopId, params.number);
		const p = await parse(request, labourModeSchema, 'draft');
		if (!('parsed' in p)) return p;
		const r = await makeDraft(user.shopId, job.id, user.id, p.parsed.labourMode);
		if (!r.ok) return refused('draft', r.message);
		return { action: 'draft', done: 'Draft made from the job log.' };
	},

	addLine: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const job = await jobOr404(user.shopId, params.number);
		const p = await parse(request, manualLineSchema, 'addLine');
		if (!('parsed' in p)) return p;
		const draft = await draftOf(user.shopId, job.id);
		if (!draft) return refused('addLine', 'Make a draft first.');
		const price = parseMoney(p.parsed.unitPrice, draft.currency);
		if (!price.ok) {
			return fail(400, {
				action: 'addLine',
				errors: { unitPrice: price.error },
				values: echoValues(p.form)
			});
		}
		const r = await addManualLine(user.shopId, draft.id, {
			kind: p.parsed.kind,
			description: p.parsed.description,
			quantity: p.parsed.quantity,
			unitPriceMinor: price.minor
		});
		if (!r.ok) return refused('addLine', r.message, echoValues(p.form));
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
		if (!draft) return refused('removeLine', 'There is no draft to change.');
		const r = await removeLine(user.shopId, draft.id, p.parsed.lineId);
		if (!r.ok) return refused('removeLine', r.message);
		return { action: 'removeLine', done: 'Line removed.' };
	},

	pick: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const job = await jobOr404(user.shopId, params.number);
		const p = await parse(request, pickPartSchema, 'pick');
		if (!('parsed' in p)) return p;
		const draft = await draftOf(user.shopId, job.id);
		if (!draft) return refused('pick', 'There is no draft to change.');
		const r = await pickPart(user.shopId, draft.id, p.parsed.lineId, p.parsed.partId);
		if (!r.ok) return refused('pick', r.message);
		return { action: 'pick', done: 'Part picked from the price list.' };
	},

	issue: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const job = await jobOr404(user.shopId, params.number);
		const p = await parse(request, invoiceIdSchema, 'issue');
		if (!('parsed' in p)) return p;
		await invoiceOfJob(user.shopId, job.id, p.parsed.invoiceId);
		const r = await issueInvoice(user.shopId, p.parsed.invoiceId, user.id);
		if (!r.ok) return refused('issue', r.message);
		return { action: 'issue', done: `Invoice ${r.number} issued. It can no longer change.` };
	},

	credit: async ({ request, params }) => {
		const user = requireRole('service_writer', 'owner');
		const job = await jobOr404(user.shopId, params.number);
		const p = await parse(request, creditSchema, 'credit');
		if (!('parsed' in p)) return p;
		await invoiceOfJob(user.shopId, job.id, p.parsed.invoiceId);
		const r = await creditInvoice(user.shopId, p.parsed.invoiceId, user.id, p.parsed.reason);
		if (!r.ok) return refused('credit', r.message, echoValues(p.form));
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
			return fail(400, {
				action: 'payment',
				errors: { amount: amount.ok ? 'The amount must be more than zero.' : amount.error },
				values: echoValues(p.form)
			});
		}
		const r = await recordPayment(user.shopId, inv.id, {
			method: p.parsed.method,
			amountMinor: amount.minor,
			byUserId: user.id
		});
		if (!r.ok) return refused('payment', r.message, echoValues(p.form));
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
		if (inv.status === 'draft') return refused('email', 'Issue the invoice before sending it.');
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
		if (!sent.ok) return refused('email', sent.message, echoValues(p.form));
		return { action: 'email', done: sent.message };
	}
} satisfies Actions;
