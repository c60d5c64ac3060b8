/** The verdict: a value against a step's spec, in the step's own unit. */
import { convert, dimensionOf, formatQuantity, unitInfo } from '../units/index';
import { stepLabel } from './pick';
import type { SpecBand, StepSpec, Verdict } from './types';

export const DEFAULT_TOLERANCE_PCT = 10;

export interface Judgement {
	specValue: { value: number; unit: string } | null;
	verdict: Verdict | null;
	band: SpecBand | null;
	problems: string[];
}

export const finite = (x: unknown): x is number => typeof x === 'number' && Number.isFinite(x);

/** Float slack at a bound: 950 mL against 0.95 L is in, however the product rounds. */
function slack(bound: number): number {
	return Math.abs(bound) * 1e-9 + 1e-12;
}

/**
 * Judges a value against a step's spec, in the step's own unit: min and max inclusive; with
 * only a nominal, nominal ± tolerancePct (shop policy, default 10 %); neither, or no unit on the
 * step: 'no_spec'. A unit of another kind gives no verdict and a problem. Never throws.
 */
export function judge(
	value: number,
	unit: string,
	step: Pick<StepSpec, 'label' | 'unit' | 'nominal' | 'min' | 'max'>,
	tolerancePct: number = DEFAULT_TOLERANCE_PCT
): Judgement {
	const out: Judgement = { specValue: null, verdict: null, band: null, problems: [] };
	try {
		const stepUnit = typeof step.unit === 'string' && step.unit ? step.unit : null;
		if (!finite(value)) {
			out.problems.push('The value is not a number.');
			return out;
		}
		if (!stepUnit || !unitInfo(stepUnit)) {
			out.verdict = 'no_spec';
			return out;
		}
		const from = unitInfo(unit);
		if (!from) {
			out.problems.push(`'${unit}' is not a unit Benchcall knows.`);
			return out;
		}
		if (dimensionOf(unit) !== dimensionOf(stepUnit)) {
			out.problems.push(
				`${stepLabel(step as StepSpec)} is measured in ${unitInfo(stepUnit)?.symbol} (${dimensionOf(stepUnit)}); ${formatQuantity(value, unit)} is a ${from.dimension}.`
			);
			return out;
		}
		const v = convert(value, unit, stepUnit);
		out.specValue = { value: v, unit: stepUnit };

		let min = finite(step.min) ? step.min : null;
		let max = finite(step.max) ? step.max : null;
		let source: SpecBand['source'] = 'spec';
		if (min === null && max === null) {
			if (!finite(step.nominal)) {
				out.verdict = 'no_spec';
				return out;
			}
			let pct = tolerancePct;
			if (!finite(pct) || pct < 0 || pct >= 100) {
				out.problems.push(
					`Tolerance ${String(tolerancePct)} % is not usable; the shop default ±${DEFAULT_TOLERANCE_PCT} % was used.`
				);
				pct = DEFAULT_TOLERANCE_PCT;
			}
			const n = step.nominal;
			const d = Math.abs(n) * pct;
			// computed in hundredths to keep 5.4 × 0.9 = 4.86 clean
			min = Number(((n * 100 - d) / 100).toPrecision(15));
			max = Number(((n * 100 + d) / 100).toPrecision(15));
			source = 'shop_tolerance';
		}
		if (min !== null && max !== null && min > max) {
			out.problems.push(`The spec of ${stepLabel(step as StepSpec)} has min above max.`);
			[min, max] = [max, min];
		}
		out.band = { min, max, source };
		if (min !== null && v < min - slack(min)) out.verdict = 'low';
		else if (max !== null && v > max + slack(max)) out.verdict = 'high';
		else out.verdict = 'in';
		return out;
	} catch (e) {
		out.verdict = null;
		out.problems.push(e instanceof Error ? e.message : 'The value could not be judged.');
		return out;
	}
}
