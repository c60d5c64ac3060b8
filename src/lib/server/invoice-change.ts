// Changing an invoice inside a transaction: the invoice locked, lines priced and totals kept
// within what can be stored, and refusals that roll the transaction back.
import { and, eq } from 'drizzle-orm';
import { fitsAmount, priceLine, sumTotals } from '$lib/money';
import { failure, type Failure } from '$lib/result';
import type { Tx } from './db';
import { invoice, invoiceLine, type Invoice } from './db/schema';

/** A line priced by the rounding rule, refused (not a 500) when it cannot be stored. */
export function priceFitting(line: Parameters<typeof priceLine>[0]) {
	let priced;
	try {
		priced = priceLine(line);
	} catch {
		throw tooLarge();
	}
	if (!fitsAmount(priced.amountMinor) || !fitsAmount(priced.taxMinor)) throw tooLarge();
	return priced;
}

export async function recomputeTotals(tx: Tx, shopId: string, invoiceId: string) {
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
export async function lockInvoice(tx: Tx, shopId: string, invoiceId: string) {
	const [row] = await tx
		.select()
		.from(invoice)
		.where(and(eq(invoice.shopId, shopId), eq(invoice.id, invoiceId)))
		.for('update');
	return row ?? null;
}

export type Refusal = Failure;

/** Thrown inside a transaction to roll it back and answer the refusal it carries. */
export class Refused extends Error {
	constructor(readonly refusal: Refusal) {
		super(refusal.message);
	}
}

/** `.catch(refusal)` on a transaction: a `Refused` thrown inside rolled it back; answer it. */
export function refusal(err: unknown): Refusal {
	if (err instanceof Refused) return err.refusal;
	throw err;
}

export const tooLarge = (): Refused =>
	new Refused(
		failure('invalid', 'The amounts are too large for one invoice: split the work over several.')
	);

export const frozen = (row: Invoice | null): Refusal | null =>
	!row
		? failure('not_found', 'No such invoice in this shop.')
		: row.status !== 'draft'
			? failure(
					'conflict',
					'This invoice is issued and cannot change: put a mistake right with a credit note.'
				)
			: null;
