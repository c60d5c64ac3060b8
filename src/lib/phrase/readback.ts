/** Words for the screen and the read-back: verdicts, a step's spec, one sentence per phrase. */
import { formatNumber, formatQuantity, unitInfo } from '../units/index';
import { finite } from './judge';
import { stepLabel } from './pick';
import type { ParsedPhrase, StepSpec, Verdict } from './types';

const VERDICT_WORDS: Record<Verdict, string> = {
	in: 'in spec',
	low: 'under',
	high: 'over',
	no_spec: 'no spec'
};

/** The words Benchcall shows and says for a verdict: in spec, under, over, no spec. */
export function verdictWords(verdict: Verdict): string {
	return VERDICT_WORDS[verdict] ?? 'no spec';
}

/**
 * A step's spec as text: "80–90 N·m", "at least 12.4 V", "at most 1.5 mm", "5.4 kgf·m"
 * (nominal only), "no spec"; with `spoken`, for read-back ("80 to 90 newton metres").
 */
export function formatSpec(
	step: Pick<StepSpec, 'unit' | 'nominal' | 'min' | 'max'>,
	opts: { spoken?: boolean } = {}
): string {
	const unit = typeof step.unit === 'string' ? step.unit : '';
	const spoken = !!opts.spoken;
	const q = (v: number) => (unit ? formatQuantity(v, unit, { spoken }) : String(v));
	const min = finite(step.min) ? step.min : null;
	const max = finite(step.max) ? step.max : null;
	if (min !== null && max !== null) {
		return spoken ? `${formatNumber(min)} to ${q(max)}` : `${formatNumber(min)}–${q(max)}`;
	}
	if (min !== null) return `at least ${q(min)}`;
	if (max !== null) return `at most ${q(max)}`;
	if (finite(step.nominal)) return q(step.nominal);
	return 'no spec';
}

/**
 * One short sentence for the read-back after a phrase: "Rear axle nut, 80 newton metres, in
 * spec"; "New drain plug washer"; "Chain slack: spec 25 to 35 millimetres"; or the first
 * problem when there is one to say.
 */
export function readBack(parsed: ParsedPhrase, steps: StepSpec[]): string {
	try {
		const step = Array.isArray(steps)
			? steps.find((s) => s && String(s.id) === parsed.stepId)
			: undefined;
		const label = step ? stepLabel(step) : null;
		const problem = parsed.problems[0] ?? null;
		switch (parsed.intent) {
			case 'measure': {
				if (!label || !parsed.quantity || !parsed.verdict) return problem ?? 'Not logged.';
				const { value, unit } = parsed.quantity;
				const said = unitInfo(unit) ? formatQuantity(value, unit, { spoken: true }) : String(value);
				return `${label}, ${said}, ${verdictWords(parsed.verdict)}`;
			}
			case 'part':
				return parsed.note ? `New ${parsed.note}` : (problem ?? 'Which part?');
			case 'note':
				return parsed.note ? 'Note taken' : (problem ?? 'Nothing to note.');
			case 'done':
				return label ? `${label}, done` : (problem ?? 'Which step?');
			case 'spec':
				return label && step
					? `${label}: spec ${formatSpec(step, { spoken: true })}`
					: (problem ?? 'Which step?');
			case 'history':
				return label ? `${label}: past readings on this vehicle` : (problem ?? 'Which step?');
			case 'next':
				return label ? `Next: ${label}` : (problem ?? 'Nothing next.');
			case 'undo':
				return 'Undo your last entry';
			default:
				return problem ?? 'Not understood.';
		}
	} catch {
		return 'Not understood.';
	}
}
