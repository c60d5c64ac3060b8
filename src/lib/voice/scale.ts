/**
 * Units that are one metric prefix apart and sound alike. The recogniser's grammar leaves them
 * out of a step's call-outs and the gate refuses them, because "metres" heard as "millimetres"
 * is the mishearing that logs a value 1000× off.
 */
import { dimensionOf, type Dimension } from '../units/index';

/**
 * Units that sound alike and differ by a metric prefix (or by centi/milli): a step in one of
 * them is never called out in another unless its kind of quantity mixes them in daily use.
 */
const SCALE_FAMILIES: string[][] = [
	['mm', 'cm', 'm'],
	['N.m', 'N.cm', 'daN.m'],
	['kgf.m', 'kgf.cm'],
	['V', 'mV'],
	['Ohm', 'kOhm'],
	['kPa', 'Pa', 'MPa']
];
/** Kinds of quantity whose units of every scale are said at the bench (oil in litres or in ml). */
const MIXED_SCALE_KINDS = new Set<Dimension>(['volume']);

/** True when `said` and `stepUnit` are the same unit one prefix apart (mm vs cm, N·m vs N·cm). */
export function isWrongScale(said: string, stepUnit: string): boolean {
	if (said === stepUnit) return false;
	const kind = dimensionOf(stepUnit);
	if (kind && MIXED_SCALE_KINDS.has(kind)) return false;
	return SCALE_FAMILIES.some((f) => f.includes(said) && f.includes(stepUnit));
}
