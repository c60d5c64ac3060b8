// Invoices, credit notes and payments. Every query is scoped by the caller's shop id.
import { randomBytes } from 'node:crypto';
import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import { buildDraftLines, type LabourMode, type LineKind } from '$lib/invoice/draft';
import { fitsAmount, MAX_AMOUNT_MINOR, priceLine, sumTotals, toDecimalString } from '$lib/money';
import { db, type Tx } from './db';
import {
	customer,
	invoice,
	invoiceCounter,
	invoiceLine,
	job,
	jobProcedure,
	jobStep,
	logEntry,
	part,
	payment,
	shop,
	user,
	vehicle,
	webhookEvent,
	type Invoice,
	type InvoiceLine,
	type Payment
} from './db/schema';
import { transitionJob } from './jobs';

export type Result<T = object> =
	({ ok: true } & T) | { ok: false; message: string; status?: number };

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

/** A line priced by the rounding rule, refused (not a 500) when it cannot be stored. */
function priceFitting(line: Parameters<typeof priceLine>[0]) {
	let priced;
	try {
		priced = priceLine(line);
	} catch {
		throw tooLarge();
	}
	if (!fitsAmount(priced.amountMinor) || !fitsAmount(priced.taxMinor)) throw tooLarge();
	return priced;
}

async function recomputeTotals(tx: Tx, shopId: string, invoiceId: string) {
	const lines = await tx
		.select({ amountMinor: invoiceLine.amountMinor, taxMinor: invoiceLine.taxMinor })
		.from(invoiceLine)
		.where(and(eq(invoiceLine.shopId, shopId), eq(invoiceLine.invoiceId, invoiceId)));
	const t = sumTotals(lines);
	if (!fitsAmount(t.subtotalMinor) || !fitsAmount(t.taxMinor) || !fitsAmount(t.totalMinor)) {
		throw tooLarge();
	}
	await tx
		.update(invoice)
		.set({ ...t, updatedAt: new Date() })
		.where(and(eq(invoice.shopId, shopId), eq(invoice.id, invoiceId)));
	return t;
}

/** Locks an invoice of this shop for change (FOR UPDATE); null when the shop has no such invoice. */
async function lockInvoice(tx: Tx, shopId: string, invoiceId: string) {
	const [row] = await tx
		.select()
		.from(invoice)
		.where(and(eq(invoice.shopId, shopId), eq(invoice.id, invoiceId)))
		.for('update');
	return row ?? null;
}

type Refusal = { ok: false; message: string; status?: number };

/** Thrown inside a transaction to roll it back and answer the refusal it carries. */
class Refused extends Error {
	constructor(readonly refusal: Refusal) {
		super(refusal.message);
	}
}

/** `.catch(refusal)` on a transaction: a `Refused` thrown inside rolled it back; answer it. */
function refusal(err: unknown): Refusal {
	if (err instanceof Refused) return err.refusal;
	throw err;
}

const tooLarge = (): Refused =>
	new Refused({
		ok: false,
		message: 'The amounts are too large for one invoice: split the work over several.'
	});

const frozen = (row: Invoice | null): Refusal | null =>
	!row
		? { ok: false, message: 'No such invoice in this shop.', status: 404 }
		: row.status !== 'draft'
			? {
					ok: false,
					message:
						'This invoice is issued and cannot change: put a mistake right with a credit note.'
				}
			: null;

/**
 * Makes (or remakes) the draft invoice of a job from its log, in one transaction. Lines the
 * service writer added by hand (sundries, discounts) are kept; lines from the log are rebuilt.
 */
export async function makeDraft(
	shopId: string,
	jobId: string,
	byUserId: string,
	labourMode?: LabourMode
): Promise<Result<{ invoiceId: string }>> {
	const answer: Promise<Result<{ invoiceId: string }>> = db.transaction(async (tx) => {
		const [j] = await tx
			.select({ id: job.id, state: job.state })
			.from(job)
			.where(and(eq(job.shopId, shopId), eq(job.id, jobId)))
			.for('update');
		if (!j) return { ok: false, message: 'No such job card in this shop.', status: 404 };
		if (j.state !== 'ready_to_invoice') {
			return {
				ok: false,
				message: 'Only a signed-off job that is ready to invoice can be invoiced.'
			};
		}
		const [s] = await tx.select().from(shop).where(eq(shop.id, shopId));
		let [draft] = await tx
			.select()
			.from(invoice)
			.where(
				and(
					eq(invoice.shopId, shopId),
					eq(invoice.jobId, jobId),
					eq(invoice.status, 'draft'),
					eq(invoice.kind, 'invoice')
				)
			)
			.for('update');
		const mode = labourMode ?? draft?.labourMode ?? 'flat_rate';
		if (!draft) {
			[draft] = await tx
				.insert(invoice)
				.values({
					shopId,
					jobId,
					currency: s.currency,
					labourMode: mode,
					labourRateMinor: s.labourRateMinor,
					taxRateBp: s.taxRateBp,
					customerToken: newCustomerToken(),
					createdBy: byUserId
				})
				.returning();
		} else {
			await tx
				.update(invoice)
				.set({
					labourMode: mode,
					currency: s.currency,
					labourRateMinor: s.labourRateMinor,
					taxRateBp: s.taxRateBp
				})
				.where(eq(invoice.id, draft.id));
		}
		const kept = await tx
			.select()
			.from(invoiceLine)
			.where(
				and(
					eq(invoiceLine.shopId, shopId),
					eq(invoiceLine.invoiceId, draft.id),
					inArray(invoiceLine.kind, ['sundry', 'discount'])
				)
			)
			.orderBy(asc(invoiceLine.position));
		await tx
			.delete(invoiceLine)
			.where(and(eq(invoiceLine.shopId, shopId), eq(invoiceLine.invoiceId, draft.id)));

		const [parts, steps, entries, procedures, staff] = await Promise.all([
			tx.select().from(part).where(eq(part.shopId, shopId)),
			tx
				.select()
				.from(jobStep)
				.where(and(eq(jobStep.shopId, shopId), eq(jobStep.jobId, jobId))),
			tx
				.select()
				.from(logEntry)
				.where(and(eq(logEntry.shopId, shopId), eq(logEntry.jobId, jobId)))
				.orderBy(asc(logEntry.seq)),
			tx
				.select()
				.from(jobProcedure)
				.where(and(eq(jobProcedure.shopId, shopId), eq(jobProcedure.jobId, jobId)))
				.orderBy(asc(jobProcedure.position)),
			tx.select({ id: user.id, name: user.name }).from(user).where(eq(user.shopId, shopId))
		]);
		const lines = buildDraftLines({
			parts,
			steps,
			entries,
			procedures,
			technicianNames: new Map(staff.map((u) => [u.id, u.name])),
			labourMode: mode,
			labourRateMinor: s.labourRateMinor,
			idleGapMinutes: s.idleGapMinutes
		});
		const rows = [
			...lines.map((l) => ({ ...l, sourceEntryId: l.sourceEntryId, sourceStepId: l.sourceStepId })),
			...kept.map((k) => ({ ...k, suggestions: [] as string[] }))
		].map((l, i) => {
			const priced = priceFitting({
				quantity: l.quantity,
				unitPriceMinor: l.unitPriceMinor,
				taxRateBp: s.taxRateBp
			});
			return {
				shopId,
				invoiceId: draft.id,
				kind: l.kind,
				description: l.description,
				partId: l.partId,
				quantity: l.quantity,
				unit: l.unit,
				unitPriceMinor: l.unitPriceMinor,
				amountMinor: priced.amountMinor,
				taxRateBp: s.taxRateBp,
				taxMinor: priced.taxMinor,
				unmatched: l.unmatched,
				sourceEntryId: l.sourceEntryId,
				sourceStepId: l.sourceStepId,
				position: i + 1
			};
		});
		if (rows.length) await tx.insert(invoiceLine).values(rows);
		await recomputeTotals(tx, shopId, draft.id);
		return { ok: true, invoiceId: draft.id };
	});
	return answer.catch(refusal);
}

/** A sundry or discount added by the service writer to a draft. */
export async function addManualLine(
	shopId: string,
	invoiceId: string,
	line: {
		kind: Extract<LineKind, 'sundry' | 'discount'>;
		description: string;
		quantity: number;
		unitPriceMinor: number;
	}
): Promise<Result> {
	const answer: Promise<Result> = db.transaction(async (tx) => {
		const row = await lockInvoice(tx, shopId, invoiceId);
		const refused = frozen(row);
		if (refused) return refused;
		// A discount always takes money off, whatever sign was typed.
		const unitPriceMinor =
			line.kind === 'discount' ? -Math.abs(line.unitPriceMinor) : line.unitPriceMinor;
		const priced = priceFitting({
			quantity: line.quantity,
			unitPriceMinor,
			taxRateBp: row!.taxRateBp
		});
		const [{ max }] = await tx
			.select({ max: sql<number>`coalesce(max(${invoiceLine.position}), 0)::int` })
			.from(invoiceLine)
			.where(and(eq(invoiceLine.shopId, shopId), eq(invoiceLine.invoiceId, invoiceId)));
		await tx.insert(invoiceLine).values({
			shopId,
			invoiceId,
			kind: line.kind,
			description: line.description,
			quantity: line.quantity,
			unit: 'each',
			unitPriceMinor,
			amountMinor: priced.amountMinor,
			taxRateBp: row!.taxRateBp,
			taxMinor: priced.taxMinor,
			position: max + 1
		});
		await recomputeTotals(tx, shopId, invoiceId);
		return { ok: true };
	});
	return answer.catch(refusal);
}

export async function removeLine(
	shopId: string,
	invoiceId: string,
	lineId: string
): Promise<Result> {
	return db.transaction(async (tx) => {
		const refused = frozen(await lockInvoice(tx, shopId, invoiceId));
		if (refused) return refused;
		await tx
			.delete(invoiceLine)
			.where(
				and(
					eq(invoiceLine.shopId, shopId),
					eq(invoiceLine.invoiceId, invoiceId),
					eq(invoiceLine.id, lineId)
				)
			);
		await recomputeTotals(tx, shopId, invoiceId);
		return { ok: true };
	});
}

/** The service writer picks the price-list part for a line the log could not match. */
export async function pickPart(
	shopId: string,
	invoiceId: string,
	lineId: string,
	partId: string
): Promise<Result> {
	const answer: Promise<Result> = db.transaction(async (tx) => {
		const row = await lockInvoice(tx, shopId, invoiceId);
		const refused = frozen(row);
		if (refused) return refused;
		const [p] = await tx
			.select()
			.from(part)
			.where(and(eq(part.shopId, shopId), eq(part.id, partId)));
		if (!p) return { ok: false, message: 'That part is not on this shop’s price list.' };
		const [l] = await tx
			.select()
			.from(invoiceLine)
			.where(
				and(
					eq(invoiceLine.shopId, shopId),
					eq(invoiceLine.invoiceId, invoiceId),
					eq(invoiceLine.id, lineId)
				)
			);
		if (!l) return { ok: false, message: 'No such line on this invoice.', status: 404 };
		const priced = priceFitting({
			quantity: l.quantity,
			unitPriceMinor: p.priceMinor,
			taxRateBp: row!.taxRateBp
		});
		await tx
			.update(invoiceLine)
			.set({
				kind: p.unit === 'each' ? 'part' : 'fluid',
				description: `${p.description} (${p.code})`,
				partId: p.id,
				unit: p.unit,
				unitPriceMinor: p.priceMinor,
				amountMinor: priced.amountMinor,
				taxMinor: priced.taxMinor,
				unmatched: false
			})
			.where(eq(invoiceLine.id, l.id));
		await recomputeTotals(tx, shopId, invoiceId);
		return { ok: true };
	});
	return answer.catch(refusal);
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
		if (lines.length === 0) return { ok: false, message: 'The invoice has no lines.' };
		const open = lines.filter((l) => l.unmatched).length;
		if (open > 0) {
			return {
				ok: false,
				message: `${open} part${open === 1 ? '' : 's'} from the log ${open === 1 ? 'has' : 'have'} no price yet: pick ${open === 1 ? 'it' : 'them'} from the price list or remove the line.`
			};
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
			.where(eq(invoice.id, invoiceId));
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
		if (!row) return { ok: false, message: 'No such invoice in this shop.', status: 404 };
		if (row.kind !== 'invoice' || (row.status !== 'issued' && row.status !== 'paid')) {
			return { ok: false, message: 'Only an issued invoice can be credited.' };
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
			.where(eq(invoice.id, row.id));
		const [j] = await tx.select({ state: job.state }).from(job).where(eq(job.id, row.jobId));
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
		if (!row) return { ok: false, message: 'No such invoice in this shop.', status: 404 };
		const taken = Boolean(p.providerReference);
		const open = row.status === 'issued' || row.status === 'paid';
		if (row.kind !== 'invoice' || !(open || (taken && row.status === 'credited'))) {
			return { ok: false, message: 'Payments are taken on an issued invoice only.' };
		}
		if (!Number.isInteger(p.amountMinor) || p.amountMinor <= 0) {
			return { ok: false, message: 'The amount must be more than zero.' };
		}
		if (p.amountMinor > MAX_AMOUNT_MINOR) {
			return { ok: false, message: 'The amount is larger than any invoice Benchcall keeps.' };
		}
		const [{ before }] = await tx
			.select({ before: sql<string>`coalesce(sum(${payment.amountMinor}), 0)::bigint` })
			.from(payment)
			.where(and(eq(payment.shopId, shopId), eq(payment.invoiceId, invoiceId)));
		if (!taken) {
			if (row.status === 'paid') {
				return { ok: false, message: 'This invoice is paid in full: nothing is owed.' };
			}
			const owed = row.totalMinor - Number(before);
			if (p.amountMinor > owed) {
				return {
					ok: false,
					message: `That is more than is owed (${toDecimalString(owed, row.currency)} ${row.currency}).`
				};
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
		if (!inv) throw new Refused({ ok: false, message: 'No such invoice.', status: 404 });
		if (inv.currency.toLowerCase() !== ev.currency.toLowerCase()) {
			throw new Refused({
				ok: false,
				message: 'The payment is in another currency.',
				status: 400
			});
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
		if (!r.ok) throw new Refused({ ...r, status: r.status ?? 400 });
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
