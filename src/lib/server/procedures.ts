// The procedure library of one shop: procedures and their steps, import and export.
// Every query is scoped by shop id. Jobs hold copies of steps (job_step), so nothing here
// changes a job.
import { and, asc, count, eq, inArray, isNull, max, sql } from 'drizzle-orm';
import {
	PROCEDURE_FILE_FORMAT,
	PROCEDURE_FILE_VERSION,
	type ProcedureFile,
	type ProcedureFileEntry,
	type Problem,
	type StepForm
} from '$lib/schemas/procedure';
import { toStoredSpec } from '$lib/procedures/spec';
import { failure, type Result } from '$lib/result';
import { stepAdapter } from '$lib/torque/adapter';
import { db, type Tx } from './db';
import { specFields } from './db/spec-fields';
import { part, procedure, procedureStep } from './db/schema';

export interface ProcedureSummary {
	id: string;
	name: string;
	appliesTo: string;
	flatRateHours: number;
	archivedAt: Date | null;
	updatedAt: Date;
	steps: number;
}

export async function listProcedures(
	shopId: string,
	opts: { archived?: boolean } = {}
): Promise<ProcedureSummary[]> {
	const rows = await db
		.select({
			id: procedure.id,
			name: procedure.name,
			appliesTo: procedure.appliesTo,
			flatRateHours: procedure.flatRateHours,
			archivedAt: procedure.archivedAt,
			updatedAt: procedure.updatedAt,
			steps: count(procedureStep.id)
		})
		.from(procedure)
		.leftJoin(
			procedureStep,
			and(eq(procedureStep.shopId, procedure.shopId), eq(procedureStep.procedureId, procedure.id))
		)
		.where(
			and(eq(procedure.shopId, shopId), opts.archived ? undefined : isNull(procedure.archivedAt))
		)
		.groupBy(procedure.shopId, procedure.id)
		.orderBy(asc(procedure.name));
	return rows;
}

export async function getProcedure(shopId: string, id: string) {
	const [row] = await db
		.select()
		.from(procedure)
		.where(and(eq(procedure.shopId, shopId), eq(procedure.id, id)))
		.limit(1);
	if (!row) return null;
	const steps = await db
		.select({
			id: procedureStep.id,
			position: procedureStep.position,
			label: procedureStep.label,
			aliases: procedureStep.aliases,
			unit: procedureStep.unit,
			nominal: procedureStep.nominal,
			min: procedureStep.min,
			max: procedureStep.max,
			caution: procedureStep.caution,
			fluid: procedureStep.fluid,
			adapterLengthMm: procedureStep.adapterLengthMm,
			adapterDirection: procedureStep.adapterDirection,
			partId: procedureStep.partId,
			partQuantity: procedureStep.partQuantity,
			partCode: part.code,
			partDescription: part.description,
			partUnit: part.unit
		})
		.from(procedureStep)
		.leftJoin(part, and(eq(part.shopId, procedureStep.shopId), eq(part.id, procedureStep.partId)))
		.where(and(eq(procedureStep.shopId, shopId), eq(procedureStep.procedureId, id)))
		.orderBy(asc(procedureStep.position));
	return { ...row, steps };
}
export type ProcedureDetail = NonNullable<Awaited<ReturnType<typeof getProcedure>>>;

export async function createProcedure(
	shopId: string,
	input: { name: string; appliesTo: string; flatRateHours: number | null }
): Promise<string> {
	const [row] = await db
		.insert(procedure)
		.values({
			shopId,
			name: input.name,
			appliesTo: input.appliesTo,
			flatRateHours: input.flatRateHours ?? 0
		})
		.returning({ id: procedure.id });
	return row.id;
}

export async function updateProcedure(
	shopId: string,
	id: string,
	input: {
		name: string;
		appliesTo: string;
		flatRateHours: number | null;
		intervalKm?: number | null;
		intervalMonths?: number | null;
	}
): Promise<boolean> {
	const rows = await db
		.update(procedure)
		.set({
			name: input.name,
			appliesTo: input.appliesTo,
			flatRateHours: input.flatRateHours ?? 0,
			intervalKm: input.intervalKm ?? null,
			intervalMonths: input.intervalMonths ?? null,
			updatedAt: new Date()
		})
		.where(and(eq(procedure.shopId, shopId), eq(procedure.id, id)))
		.returning({ id: procedure.id });
	return rows.length > 0;
}

export async function setArchived(shopId: string, id: string, archived: boolean) {
	const rows = await db
		.update(procedure)
		.set({ archivedAt: archived ? new Date() : null, updatedAt: new Date() })
		.where(and(eq(procedure.shopId, shopId), eq(procedure.id, id)))
		.returning({ id: procedure.id });
	return rows.length > 0;
}

/** A copy with all its steps, named "… (copy)"; returns the new id. */
export async function duplicateProcedure(shopId: string, id: string): Promise<string | null> {
	return db.transaction(async (tx) => {
		const [src] = await tx
			.select()
			.from(procedure)
			.where(and(eq(procedure.shopId, shopId), eq(procedure.id, id)));
		if (!src) return null;
		const [copy] = await tx
			.insert(procedure)
			.values({
				shopId,
				name: `${src.name} (copy)`.slice(0, 200),
				appliesTo: src.appliesTo,
				flatRateHours: src.flatRateHours
			})
			.returning({ id: procedure.id });
		const steps = await tx
			.select()
			.from(procedureStep)
			.where(and(eq(procedureStep.shopId, shopId), eq(procedureStep.procedureId, id)))
			.orderBy(asc(procedureStep.position));
		if (steps.length) {
			await tx.insert(procedureStep).values(
				steps.map((s) => ({
					shopId,
					procedureId: copy.id,
					position: s.position,
					...specFields(s)
				}))
			);
		}
		return copy.id;
	});
}

async function touch(tx: Tx, shopId: string, procedureId: string) {
	await tx
		.update(procedure)
		.set({ updatedAt: new Date() })
		.where(and(eq(procedure.shopId, shopId), eq(procedure.id, procedureId)));
}

async function ownsPart(tx: Tx, shopId: string, partId: string) {
	const [row] = await tx
		.select({ id: part.id })
		.from(part)
		.where(and(eq(part.shopId, shopId), eq(part.id, partId)));
	return Boolean(row);
}

export type StepSaveResult = Result;

/** Adds a step at the end, or changes one (`stepId`). */
export async function saveStep(
	shopId: string,
	procedureId: string,
	input: StepForm
): Promise<StepSaveResult> {
	const spec = toStoredSpec(input);
	if (!spec.ok) return failure('invalid', spec.message, spec.field);
	return db.transaction(async (tx) => {
		const [proc] = await tx
			.select({ id: procedure.id })
			.from(procedure)
			.where(and(eq(procedure.shopId, shopId), eq(procedure.id, procedureId)))
			.for('update');
		if (!proc) return failure('not_found', 'No such procedure in this shop.');
		if (input.partId && !(await ownsPart(tx, shopId, input.partId))) {
			return failure('invalid', 'Pick a part from the price list.', 'partId');
		}
		const values = {
			label: input.label,
			aliases: input.aliases,
			unit: input.unit || null,
			nominal: spec.nominal,
			min: spec.min,
			max: spec.max,
			caution: input.caution || null,
			fluid: input.fluid || null,
			adapterLengthMm: input.adapterDirection ? input.adapterLengthMm : null,
			adapterDirection: input.adapterLengthMm !== null ? input.adapterDirection || null : null,
			partId: input.partId || null,
			partQuantity: input.partId ? input.partQuantity : null
		};
		if (input.stepId) {
			const rows = await tx
				.update(procedureStep)
				.set(values)
				.where(
					and(
						eq(procedureStep.shopId, shopId),
						eq(procedureStep.procedureId, procedureId),
						eq(procedureStep.id, input.stepId)
					)
				)
				.returning({ id: procedureStep.id });
			if (!rows.length) return failure('not_found', 'No such step in this procedure.');
		} else {
			const [last] = await tx
				.select({ position: max(procedureStep.position) })
				.from(procedureStep)
				.where(eq(procedureStep.procedureId, procedureId));
			await tx
				.insert(procedureStep)
				.values({ shopId, procedureId, position: (last?.position ?? 0) + 1, ...values });
		}
		await touch(tx, shopId, procedureId);
		return { ok: true };
	});
}

export async function deleteStep(shopId: string, procedureId: string, stepId: string) {
	return db.transaction(async (tx) => {
		const rows = await tx
			.delete(procedureStep)
			.where(
				and(
					eq(procedureStep.shopId, shopId),
					eq(procedureStep.procedureId, procedureId),
					eq(procedureStep.id, stepId)
				)
			)
			.returning({ id: procedureStep.id });
		if (rows.length) await touch(tx, shopId, procedureId);
		return rows.length > 0;
	});
}

/** Swaps a step with its neighbour above or below. */
export async function moveStep(
	shopId: string,
	procedureId: string,
	stepId: string,
	direction: 'up' | 'down'
): Promise<boolean> {
	return db.transaction(async (tx) => {
		const steps = await tx
			.select({ id: procedureStep.id, position: procedureStep.position })
			.from(procedureStep)
			.where(and(eq(procedureStep.shopId, shopId), eq(procedureStep.procedureId, procedureId)))
			.orderBy(asc(procedureStep.position))
			.for('update');
		const i = steps.findIndex((s) => s.id === stepId);
		const j = direction === 'up' ? i - 1 : i + 1;
		if (i < 0 || j < 0 || j >= steps.length) return false;
		// Renumber 1..n with the two swapped, so equal positions from old data cannot stick.
		[steps[i], steps[j]] = [steps[j], steps[i]];
		for (const [k, s] of steps.entries()) {
			await tx
				.update(procedureStep)
				.set({ position: k + 1 })
				.where(and(eq(procedureStep.shopId, shopId), eq(procedureStep.id, s.id)));
		}
		await touch(tx, shopId, procedureId);
		return true;
	});
}

/** A refused import names every problem where it was found; nothing is saved. */
export type ImportResult = Result<
	{ created: { id: string; name: string }[] },
	{ problems: Problem[] }
>;

/** The failure of an import: `invalid` for a file that cannot be read, else `unprocessable`. */
export function importRefused(kind: 'invalid' | 'unprocessable', problems: Problem[]) {
	const n = problems.length;
	const words = `${n} ${n === 1 ? 'problem' : 'problems'} in the file: nothing was saved.`;
	return { ...failure(kind, words), problems };
}

/**
 * Saves checked procedures in one transaction: every part code must be on the shop's price
 * list, else nothing is saved and each unknown code is reported where it was found.
 */
export async function importProcedures(
	shopId: string,
	entries: ProcedureFileEntry[],
	where: (procIndex: number, stepIndex: number) => string = (p, s) =>
		`procedures[${p}].steps[${s}].part.code`
): Promise<ImportResult> {
	return db.transaction(async (tx) => {
		const codes = [
			...new Set(entries.flatMap((e) => e.steps.flatMap((s) => (s.part ? [s.part.code] : []))))
		];
		const known = codes.length
			? await tx
					.select({ id: part.id, code: part.code })
					.from(part)
					.where(and(eq(part.shopId, shopId), inArray(part.code, codes)))
			: [];
		const byCode = new Map(known.map((p) => [p.code, p.id]));
		const problems: Problem[] = [];
		entries.forEach((e, p) =>
			e.steps.forEach((s, i) => {
				if (s.part && !byCode.has(s.part.code)) {
					problems.push({
						where: where(p, i),
						message: `The part code '${s.part.code}' is not on the price list.`
					});
				}
			})
		);
		if (problems.length) return importRefused('unprocessable', problems);
		const created: { id: string; name: string }[] = [];
		for (const e of entries) {
			const [row] = await tx
				.insert(procedure)
				.values({ shopId, name: e.name, appliesTo: e.appliesTo, flatRateHours: e.flatRateHours })
				.returning({ id: procedure.id, name: procedure.name });
			if (e.steps.length) {
				await tx.insert(procedureStep).values(
					e.steps.map((s, i) => ({
						shopId,
						procedureId: row.id,
						position: i + 1,
						label: s.label,
						aliases: s.aliases,
						unit: s.unit,
						nominal: s.nominal,
						min: s.min,
						max: s.max,
						caution: s.caution,
						fluid: s.fluid,
						adapterLengthMm: s.adapter?.lengthMm ?? null,
						adapterDirection: s.adapter?.direction ?? null,
						partId: s.part ? byCode.get(s.part.code)! : null,
						partQuantity: s.part?.quantity ?? null
					}))
				);
			}
			created.push(row);
		}
		return { ok: true, created };
	});
}

/** The shop's procedures (or the given ones) in Benchcall's procedure file format. */
export async function exportProcedures(shopId: string, ids?: string[]): Promise<ProcedureFile> {
	const procs = await db
		.select()
		.from(procedure)
		.where(
			and(
				eq(procedure.shopId, shopId),
				ids ? (ids.length ? inArray(procedure.id, ids) : sql`false`) : isNull(procedure.archivedAt)
			)
		)
		.orderBy(asc(procedure.name));
	const steps = procs.length
		? await db
				.select({ step: procedureStep, code: part.code })
				.from(procedureStep)
				.leftJoin(
					part,
					and(eq(part.shopId, procedureStep.shopId), eq(part.id, procedureStep.partId))
				)
				.where(
					and(
						eq(procedureStep.shopId, shopId),
						inArray(
							procedureStep.procedureId,
							procs.map((p) => p.id)
						)
					)
				)
				.orderBy(asc(procedureStep.position))
		: [];
	return {
		format: PROCEDURE_FILE_FORMAT,
		version: PROCEDURE_FILE_VERSION,
		exportedAt: new Date().toISOString(),
		procedures: procs.map((p) => ({
			name: p.name,
			appliesTo: p.appliesTo,
			flatRateHours: p.flatRateHours,
			steps: steps
				.filter((s) => s.step.procedureId === p.id)
				.map(({ step: s, code }) => ({
					label: s.label,
					aliases: s.aliases,
					unit: s.unit,
					nominal: s.nominal,
					min: s.min,
					max: s.max,
					caution: s.caution,
					fluid: s.fluid,
					adapter: stepAdapter(s.adapterLengthMm, s.adapterDirection),
					part: code && s.partQuantity ? { code, quantity: s.partQuantity } : null
				}))
		}))
	};
}
