/**
 * The call bar's readings of a phrase, and what the Bench says about each. Pure: the page's state
 * module and its components call these; tests run them without a browser.
 */
import type { ParsedPhrase, StepSpec } from '../phrase/index';
import { formatQuantity } from '../units/index';
import { withStep } from './choose';
import type { BenchStep, StepDefinition } from './types';

/** One reading of the call bar's phrase: the best one first, then other steps it could mean. */
export interface PreviewRow {
	key: string;
	parsed: ParsedPhrase;
	step: BenchStep | null;
	picked: boolean;
}

/** "job 1042" in the call bar opens that job on the Bench. */
export const JOB_RE = /^\s*job\s*#?\s*(\d{1,9})\s*$/i;

/** Intents whose step may be picked from the other candidates with the arrow keys. */
const PICKABLE = ['measure', 'done', 'part', 'spec', 'history', 'unknown'];

/** Steps in the phrase engine's shape (null limits left out; no done state: not done). */
export function toStepSpecs(steps: (StepDefinition & { done?: boolean })[]): StepSpec[] {
	return steps.map((st) => ({
		id: st.id,
		label: st.label,
		aliases: st.aliases,
		unit: st.unit ?? undefined,
		nominal: st.nominal ?? undefined,
		min: st.min ?? undefined,
		max: st.max ?? undefined,
		fluid: st.fluid ?? undefined,
		done: st.done ?? false
	}));
}

export function stepsById(steps: readonly BenchStep[]): ReadonlyMap<string, BenchStep> {
	return new Map(steps.map((st) => [st.id, st]));
}

/** The best reading, then up to two other steps the phrase could mean, judged against each. */
export function previewRows(
	text: string,
	parsed: ParsedPhrase | null,
	steps: ReadonlyMap<string, BenchStep>,
	specs: readonly StepSpec[],
	tolerancePct: number
): PreviewRow[] {
	if (!parsed || JOB_RE.test(text)) return [];
	const top: PreviewRow = {
		key: 'top',
		parsed,
		step: parsed.stepId ? (steps.get(parsed.stepId) ?? null) : null,
		picked: false
	};
	const out = [top];
	if (!PICKABLE.includes(parsed.intent)) return out;
	for (const c of parsed.candidates) {
		if (c.stepId === parsed.stepId) continue;
		const spec = specs.find((s) => s.id === c.stepId);
		const st = steps.get(c.stepId);
		if (!spec || !st) continue;
		const p = parsed.intent === 'unknown' ? { ...parsed, intent: 'spec' as const } : parsed;
		out.push({ key: c.stepId, parsed: withStep(p, spec, tolerancePct), step: st, picked: true });
		if (out.length >= 3) break;
	}
	return out;
}

/** The spec of a step as the Bench shows it. */
export function specText(
	st: Pick<BenchStep, 'unit' | 'min' | 'max' | 'nominal'> | null,
	tolerancePct: number
): string {
	if (!st) return '';
	if (!st.unit) return 'check, no value';
	const unit = st.unit;
	const q = (v: number) => formatQuantity(v, unit);
	if (st.min !== null && st.max !== null) return `${q(st.min)} – ${q(st.max)}`;
	if (st.min !== null) return `≥ ${q(st.min)}`;
	if (st.max !== null) return `≤ ${q(st.max)}`;
	if (st.nominal !== null) return `${q(st.nominal)} ± ${tolerancePct} %`;
	return 'no spec';
}

/** Why this reading cannot be logged, or null. Mirrors the server's checks. */
export function blocker(row: PreviewRow): string | null {
	const p = row.parsed;
	switch (p.intent) {
		case 'measure':
			if (!row.step) return p.problems[0] ?? 'No step of this job matches.';
			if (!p.quantity || p.verdict === null)
				return p.problems[0] ?? `That value cannot be judged against ${row.step.label}.`;
			return null;
		case 'done':
			return row.step ? null : (p.problems[0] ?? 'Say which step is done.');
		case 'part':
		case 'note':
			return p.note ? null : (p.problems[0] ?? 'Say a little more.');
		case 'undo':
		case 'next':
			return null;
		case 'spec':
		case 'history':
			return row.step ? null : (p.problems[0] ?? 'No step of this job matches.');
		default:
			return p.problems[0] ?? 'Benchcall could not read that phrase.';
	}
}

const spokenVerdict = { in: 'in spec', low: 'under spec', high: 'over spec' } as const;

/** What the Bench reads back once an entry is logged ("Rear axle, 80 newton metres, in spec"). */
export function spokenResult(row: PreviewRow): string {
	const p = row.parsed;
	if (p.intent === 'measure' && row.step && p.quantity) {
		const verdictWord =
			p.verdict === 'in' || p.verdict === 'low' || p.verdict === 'high'
				? spokenVerdict[p.verdict]
				: 'no spec';
		const said = formatQuantity(p.quantity.value, p.quantity.unit, { spoken: true });
		return `${row.step.label}, ${said}, ${verdictWord}`;
	}
	if (p.intent === 'done' && row.step) return `${row.step.label}, done`;
	if (p.intent === 'part') return `Fitted ${p.note ?? 'part'}`;
	if (p.intent === 'note') return 'Note logged';
	if (p.intent === 'undo') return 'Your last entry is retracted';
	return '';
}

/** Per procedure of the job: its name and how many of its steps are done. */
export function procedureProgress(steps: readonly BenchStep[]) {
	const groups = new Map<string, { id: string; name: string; done: number; total: number }>();
	for (const st of steps) {
		const g = groups.get(st.procedureId) ?? {
			id: st.procedureId,
			name: st.procedureName,
			done: 0,
			total: 0
		};
		g.total++;
		if (st.done) g.done++;
		groups.set(st.procedureId, g);
	}
	return [...groups.values()];
}
