/**
 * Another step picked for a phrase (arrow keys in the call bar): the same value judged against
 * that step. Pure: the call bar's preview and the server's stored verdict use the same code.
 */
import { fluidJudgement, judge, type ParsedPhrase, type StepSpec } from '../phrase/index';

/** Intents whose step the technician may pick from the candidates. */
export const pickableIntents: readonly ParsedPhrase['intent'][] = [
	'measure',
	'done',
	'part',
	'spec',
	'history'
];

export function withStep(
	parsed: ParsedPhrase,
	step: StepSpec,
	tolerancePct?: number
): ParsedPhrase {
	if (!pickableIntents.includes(parsed.intent)) return parsed;
	// the grade, judged again against the picked step's fluid spec
	const fluid =
		parsed.intent === 'measure' || parsed.intent === 'done'
			? fluidJudgement(step, parsed.fluid)
			: null;
	const fluidVerdict = fluid?.verdict ?? null;
	const fluidProblems = fluid?.problems ?? [];
	if (parsed.intent !== 'measure') {
		return { ...parsed, stepId: step.id, problems: fluidProblems, fluidVerdict };
	}
	if (!parsed.quantity) {
		return {
			...parsed,
			stepId: step.id,
			problems: [`No value heard for ${step.label}.`, ...fluidProblems],
			fluidVerdict
		};
	}
	// A unit that was assumed from the first match is the picked step's unit instead.
	const assumed = parsed.unitAssumed || parsed.quantity.unit === '1';
	const unit = assumed && step.unit ? step.unit : parsed.quantity.unit;
	const judged = judge(parsed.quantity.value, unit, step, tolerancePct);
	return {
		...parsed,
		stepId: step.id,
		quantity: { value: parsed.quantity.value, unit },
		specValue: judged.specValue,
		verdict: judged.verdict,
		band: judged.band,
		problems: [...judged.problems, ...fluidProblems],
		fluidVerdict
	};
}
