import type { ProcedureStep } from './schema';

/** The spec columns a library step shares with its copies (a duplicate, or a job's step). */
export type SpecFields = Pick<
	ProcedureStep,
	| 'label'
	| 'aliases'
	| 'unit'
	| 'nominal'
	| 'min'
	| 'max'
	| 'caution'
	| 'fluid'
	| 'adapterLengthMm'
	| 'adapterDirection'
	| 'partId'
	| 'partQuantity'
>;

/** Just the spec of a step, to copy onto another row. */
export function specFields(s: SpecFields): SpecFields {
	return {
		label: s.label,
		aliases: s.aliases,
		unit: s.unit,
		nominal: s.nominal,
		min: s.min,
		max: s.max,
		caution: s.caution,
		fluid: s.fluid,
		adapterLengthMm: s.adapterLengthMm,
		adapterDirection: s.adapterDirection,
		partId: s.partId,
		partQuantity: s.partQuantity
	};
}
