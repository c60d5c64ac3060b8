// Invoices and credit notes: reading them, issuing a draft and crediting an issued invoice (the
// draft's lines: invoice-lines.ts; payments: payments.ts). Every query is scoped by shop id.
import { randomBytes } from 'node:crypto';
import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import { failure, type Result } from '$lib/result';
import { db, type Tx } from './db';
import {
	customer,
	invoice,
	invoiceCounter,
	invoiceLine,
	job,
	part,
	payment,
	shop,
	vehicle,
	type Invoice,
	type InvoiceLine,
	type Payment
} from './db/schema';
import { transitionJob } from './jobs';

export type { Result };
import { frozen, lockInvoice } from './invoice-change';

/** 256 random bits, base64url: the customer's private page cannot be guessed. */
export function newCustomerToken(): string {
	return randomBytes(32).toString('base64url');
}

export async function findJobByNumber(shopId: string, number: number) {
	const [row] = await db
		.select({
			id: job.id,
			number: job.number,
			state: job.state,
			concern: job.concern,
			odometer: job.odometer,
			odometerUnit: job.odometerUnit,
			signedOffAt: job.signedOffAt,
			createdAt: job.createdAt,
			customerName: customer.name,
			customerEmail: customer.email,
			customerPhone: customer.phone,
			registration: vehicle.registration,
			make: vehicle.make,
			model: vehicle.model
		})
		.from(job)
		.leftJoin(customer, and(eq(customer.id, job.customerId), eq(customer.shopId, shopId)))
		.leftJoin(vehicle, and(eq(vehicle.id, job.vehicleId), eq(vehicle.shopId, shopId)))
		.where(and(eq(job.shopId, shopId), eq(job.number, number)))
		.limit(1);
	return row ?? null;
}
export type JobHeader = NonNullable<Awaited<ReturnType<typeof findJobByNumber>>>;

export interface InvoiceWithLines extends Invoice {
	lines: InvoiceLine[];
	payments: Payment[];
	paidMinor: number;
	/**
	 * Money the shop holds beyond what is owed and must give back: every payment on a credited
	 * invoice, or what was paid above the total (a second checkout paid at the provider).
	 */
	refundDueMinor: number;
}

/** What was paid beyond what is owed: all of it once the invoice is credited. */
export function refundDue(status: Invoice['status'], totalMinor: number, paidMinor: number) {
	return status === 'credited' ? paidMinor : Math.max(0, paidMinor - totalMinor);
}

async function withLines(shopId: string, rows: Invoice[]): Promise<InvoiceWithLines[]> {
	if (rows.length === 0) return [];
	const ids = rows.map((r) => r.id);
	const lines = await db
		.select()
		.from(invoiceLine)
		.where(and(eq(invoiceLine.shopId, shopId), inArray(invoiceLine.invoiceId, ids)))
		.orderBy(asc(invoiceLine.position));
	const pays = await db
		.select()
		.from(payment)
		.where(and(eq(payment.shopId, shopId), inArray(payment.invoiceId, ids)))
		.orderBy(asc(payment.receivedAt));
	return rows.map((r) => {
		const p = pays.filter((x) => x.invoiceId === r.id);
		const paidMinor = p.reduce((s, x) => s + x.amountMinor, 0);
		return {
			...r,
			lines: lines.filter((l) => l.invoiceId === r.id),
			payments: p,
			paidMinor,
			refundDueMinor: refundDue(r.status, r.totalMinor, paidMinor)
		};
	});
}

/** Every invoice and credit note of a job, newest first. */
export async function jobInvoices(shopId: string, jobId: string) {
	const rows = await db
		.select()
		.from(invoice)
		.where(and(eq(invoice.shopId, shopId), eq(invoice.jobId, jobId)))
		.orderBy(desc(invoice.createdAt));
	return withLines(shopId, rows);
}

export async function getInvoice(shopId: string, invoiceId: string) {
	const rows = await db
		.select()
		.from(invoice)
		.where(and(eq(invoice.shopId, shopId), eq(invoice.id, invoiceId)))
		.limit(1);
	return (await withLines(shopId, rows))[0] ?? null;
}

/** The customer's view: by the unguessable token alone (no sign-in), with its shop. */
export async function invoiceByToken(token: string) {
	if (!/^[A-Za-z0-9_-]{40,60}$/.test(token)) return null;
	const [row] = await db.select().from(invoice).where(eq(invoice.customerToken, token)).limit(1);
	if (!row || row.status === 'draft') return null;
	const [inv] = await withLines(row.shopId, [row]);
	const [s] = await db.select().from(shop).where(eq(shop.id, row.shopId)).limit(1);
	const [j] = await db
		.select({ number: job.number })
		.from(job)
		.where(and(eq(job.shopId, row.shopId), eq(job.id, row.jobId)));
	return { invoice: inv, shop: s, jobNumber: j.number };
}

/**
 * The shop's next invoice number, taken in the caller's transaction. The counter row is
 * locked by `update … returning` until that transaction ends, so concurrent issuers queue and
 * a rolled-back issue gives its number back: no gaps, no duplicates.
 */
async function nextNumber(tx: Tx, shopId: string): Promise<number> {
	await tx.insert(invoiceCounter).values({ shopId, nextNumber: 1 }).onConflictDoNothing();
	const [row] = await tx
		.update(invoiceCounter)
		.set({ nextNumber: sql`${invoiceCounter.nextNumber} + 1` })
		.where(eq(invoiceCounter.shopId, shopId))
		.returning({ taken: sql<number>`${invoiceCounter.nextNumber} - 1` });
	return row.taken;
}

/** Issues a draft: next number, frozen from now on; the job becomes invoiced. */
export async function issueInvoice(
	shopId: string,
	invoiceId: string,
	byUserId: string
): Promise<Result<{ number: number }>> {
	return db.transaction(async (tx) => {
		const row = await lockInvoice(tx, shopId, invoiceId);
		const refused = frozen(row);
		if (refused) return refused;
		const lines = await tx
			.select({ unmatched: invoiceLine.unmatched })
			.from(invoiceLine)
			.where(and(eq(invoiceLine.shopId, shopId), eq(invoiceLine.invoiceId, invoiceId)));
		if (lines.length === 0) return failure('conflict', 'The invoice has no lines.');
		const open = lines.filter((l) => l.unmatched).length;
		if (open > 0) {
			return failure(
				'conflict',
				`${open} part${open === 1 ? '' : 's'} from the log ${open === 1 ? 'has' : 'have'} no price yet: pick ${open === 1 ? 'it' : 'them'} from the price list or remove the line.`
			);
		}
		const moved = await transitionJob(shopId, row!.jobId, 'invoiced', {
			byUserId,
			expectedFrom: 'ready_to_invoice',
			tx
		});
		if (!moved.ok) return moved;
		const number = await nextNumber(tx, shopId);
		await tx
			.update(invoice)
			.set({
				number,
				status: 'issued',
				issuedAt: new Date(),
				issuedBy: byUserId,
				updatedAt: new Date()
			})
			.where(and(eq(invoice.shopId, shopId), eq(invoice.id, invoiceId)));
		return { ok: true, number };
	});
}

/**
 * A credit note for an issued invoice: every line reversed exactly, issued at once with the
 * next number. The invoice is marked credited; an invoiced (unpaid) job goes back to
 * ready to invoice, so a corrected invoice can be drafted.
 */
export async function creditInvoice(
	shopId: string,
	invoiceId: string,
	byUserId: string,
	reason: string
): Promise<Result<{ number: number; creditNoteId: string; checkoutSessionId: string | null }>> {
	return db.transaction(async (tx) => {
		const row = await lockInvoice(tx, shopId, invoiceId);
		if (!row) return failure('not_found', 'No such invoice in this shop.');
		if (row.kind !== 'invoice' || (row.status !== 'issued' && row.status !== 'paid')) {
			return failure('conflict', 'Only an issued invoice can be credited.');
		}
		const lines = await tx
			.select()
			.from(invoiceLine)
			.where(and(eq(invoiceLine.shopId, shopId), eq(invoiceLine.invoiceId, invoiceId)))
			.orderBy(asc(invoiceLine.position));
		const number = await nextNumber(tx, shopId);
		const [note] = await tx
			.insert(invoice)
			.values({
				shopId,
				jobId: row.jobId,
				kind: 'credit_note',
				number,
				status: 'issued',
				currency: row.currency,
				labourMode: row.labourMode,
				labourRateMinor: row.labourRateMinor,
				taxRateBp: row.taxRateBp,
				subtotalMinor: -row.subtotalMinor,
				taxMinor: -row.taxMinor,
				totalMinor: -row.totalMinor,
				issuedAt: new Date(),
				issuedBy: byUserId,
				creditFor: row.id,
				customerToken: newCustomerToken(),
				createdBy: byUserId
			})
			.returning();
		if (lines.length) {
			await tx.insert(invoiceLine).values(
				lines.map((l) => ({
					shopId,
					invoiceId: note.id,
					kind: l.kind,
					description: l.description,
					partId: l.partId,
					quantity: l.quantity,
					unit: l.unit,
					unitPriceMinor: -l.unitPriceMinor,
					amountMinor: -l.amountMinor,
					taxRateBp: l.taxRateBp,
					taxMinor: -l.taxMinor,
					position: l.position
				}))
			);
		}
		await tx
			.update(invoice)
			.set({ status: 'credited', updatedAt: new Date() })
			.where(and(eq(invoice.shopId, shopId), eq(invoice.id, row.id)));
		const [j] = await tx
			.select({ state: job.state })
			.from(job)
			.where(and(eq(job.shopId, shopId), eq(job.id, row.jobId)));
		if (j?.state === 'invoiced') {
			const moved = await transitionJob(shopId, row.jobId, 'ready_to_invoice', {
				byUserId,
				reason: `Credit note ${number}: ${reason}`,
				tx
			});
			if (!moved.ok) throw new Error(moved.message);
		}
		return { ok: true, number, creditNoteId: note.id, checkoutSessionId: row.checkoutSessionId };
	});
}

/** Price-list parts of the shop, for picking a part for an unmatched line. */
export async function priceList(shopId: string) {
	return db
		.select({
			id: part.id,
			code: part.code,
			description: part.description,
			unit: part.unit,
			priceMinor: part.priceMinor
		})
		.from(part)
		.where(and(eq(part.shopId, shopId), eq(part.active, true)))
		.orderBy(asc(part.code));
}
