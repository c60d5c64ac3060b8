// A job's draft invoice: made from the job log, and the lines the service writer adds, removes
// or prices from the price list. Every query is scoped by the caller's shop id.
import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { buildDraftLines, type LabourMode, type LineKind } from '$lib/invoice/draft';
import { failure, type Result } from '$lib/result';
import { db } from './db';
import {
	invoice,
	invoiceLine,
	job,
	jobProcedure,
	jobStep,
	logEntry,
	part,
	shop,
	user
} from './db/schema';

import { frozen, lockInvoice, priceFitting, recomputeTotals, refusal } from './invoice-change';
import { newCustomerToken } from './invoices';

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
		if (!j) return failure('not_found', 'No such job card in this shop.');
		if (j.state !== 'ready_to_invoice') {
			return failure('conflict', 'Only a signed-off job that is ready to invoice can be invoiced.');
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
				.where(and(eq(invoice.shopId, shopId), eq(invoice.id, draft.id)));
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
		if (!p) return failure('not_found', 'That part is not on this shop’s price list.');
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
		if (!l) return failure('not_found', 'No such line on this invoice.');
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
			.where(and(eq(invoiceLine.shopId, shopId), eq(invoiceLine.id, l.id)));
		await recomputeTotals(tx, shopId, invoiceId);
		return { ok: true };
	});
	return answer.catch(refusal);
}
