// What an append writes: the phrase read against the job's steps, why it cannot be logged, and
// the new entry's columns. No database here: the append path decides, these only compute.
import { withStep } from '$lib/bench/choose';
import {
	parsePhrase,
	type FluidVerdict,
	type ParsedPhrase,
	type StepSpec,
	type Verdict
} from '$lib/phrase';
import {
	adapterFromMm,
	adapterInUse,
	signedLength,
	stepAdapter,
	wrenchSetting
} from '$lib/torque/adapter';
import { dimensionOf } from '$lib/units';
import type { StepDefinition } from '$lib/bench/types';
import type { Actor } from '../bench/job';

/** How far ahead of the server's clock a device's time may be before it is clamped. */
export const CLOCK_SKEW_MS = 2 * 60_000;

export interface AppendInput {
	id: string;
	text: string;
	source: 'typed' | 'voice';
	occurredAt?: string;
	torqueToolId?: string | null;
	/** An adapter picked on the Bench (signed mm); one said in the text wins. */
	adapterMm?: number | null;
	stepId?: string;
	retracts?: string;
}

function clampTime(t: Date, now: Date): Date {
	if (Number.isNaN(t.getTime())) return now;
	return t.getTime() > now.getTime() + CLOCK_SKEW_MS ? now : t;
}

/** Intents that write an entry of their own kind. */
export function isLogged(intent: ParsedPhrase['intent']): intent is NewEntry['kind'] {
	return intent === 'measure' || intent === 'part' || intent === 'note' || intent === 'done';
}

/**
 * The phrase read against the job's steps; null when the picked step is not on the job. A time
 * in the phrase ("… at 10:30") is the shop's clock time on the day the entry was typed.
 */
export function readPhrase(
	specs: StepSpec[],
	pct: number,
	input: AppendInput,
	now: Date,
	timeZone?: string
) {
	const deviceTime = input.occurredAt ? clampTime(new Date(input.occurredAt), now) : now;
	let parsed = parsePhrase(input.text, {
		steps: specs,
		now: deviceTime,
		tolerancePct: pct,
		timeZone
	});
	if (input.stepId) {
		const picked = specs.find((st) => st.id === input.stepId);
		if (!picked) return null;
		parsed = withStep(parsed, picked, pct);
	}
	return { parsed, deviceTime };
}

export function stepOf<T extends { id: string }>(steps: T[], parsed: ParsedPhrase): T | null {
	return parsed.stepId ? (steps.find((st) => st.id === parsed.stepId) ?? null) : null;
}

export interface NewEntry {
	id: string;
	shopId: string;
	jobId: string;
	jobStepId: string | null;
	authorId: string;
	kind: 'measure' | 'part' | 'note' | 'done';
	rawText: string;
	source: AppendInput['source'];
	value: number | null;
	unit: string | null;
	specValue: number | null;
	specUnit: string | null;
	verdict: Verdict | null;
	fluid: string | null;
	fluidVerdict: FluidVerdict | null;
	note: string | null;
	torqueToolId: string | null;
	overdue: boolean;
	adapterMm: number | null;
	toolLengthMm: number | null;
	wrenchSetting: number | null;
	wrenchSettingUnit: string | null;
	/** ISO 8601 (drizzle's client passes timestamps through as text). */
	occurredAt: string;
}

/** The time an entry is stored with: the phrase's back-date, else the device's time. */
export function entryTime(read: { parsed: ParsedPhrase; deviceTime: Date }, now: Date): Date {
	return read.parsed.occurredAt
		? clampTime(new Date(read.parsed.occurredAt), now)
		: clampTime(read.deviceTime, now);
}

/** The torque tool an entry is made with, as the append sees it. */
export interface BenchTool {
	id: string;
	overdue: boolean;
	lengthMm: number | null;
}

export function newEntry(
	actor: Actor,
	jobId: string,
	input: AppendInput,
	read: { parsed: ParsedPhrase; deviceTime: Date },
	step: StepDefinition | null,
	tool: BenchTool | null,
	now: Date
): NewEntry {
	const { parsed } = read;
	const measured = parsed.intent === 'measure';
	const torque = measured && step?.unit ? dimensionOf(step.unit) === 'torque' : false;
	const picked =
		input.adapterMm !== undefined && input.adapterMm !== null
			? adapterFromMm(input.adapterMm)
			: null;
	// said, else picked on the Bench, else the step's own
	const inUse = adapterInUse(
		parsed.adapter,
		picked,
		stepAdapter(step?.adapterLengthMm, step?.adapterDirection)
	);
	const adapter = torque ? (inUse?.adapter ?? null) : null;
	const setting =
		adapter && parsed.specValue
			? wrenchSetting(parsed.specValue.value, tool?.lengthMm, adapter).setting
			: null;
	const occurredAt = entryTime(read, now);
	return {
		id: input.id,
		shopId: actor.shopId,
		jobId,
		jobStepId: step?.id ?? null,
		authorId: actor.id,
		kind: parsed.intent as NewEntry['kind'],
		rawText: input.text,
		source: input.source,
		value: measured ? (parsed.quantity?.value ?? null) : null,
		unit: measured ? (parsed.quantity?.unit ?? null) : null,
		specValue: measured ? (parsed.specValue?.value ?? null) : null,
		specUnit: measured ? (parsed.specValue?.unit ?? null) : null,
		verdict: measured ? parsed.verdict : null,
		fluid: measured || parsed.intent === 'done' ? parsed.fluid : null,
		fluidVerdict: measured || parsed.intent === 'done' ? parsed.fluidVerdict : null,
		note: parsed.note,
		torqueToolId: tool?.id ?? null,
		overdue: tool?.overdue ?? false,
		adapterMm: adapter ? signedLength(adapter) : null,
		toolLengthMm: adapter ? (tool?.lengthMm ?? null) : null,
		wrenchSetting: setting,
		wrenchSettingUnit: setting !== null ? (parsed.specValue?.unit ?? null) : null,
		occurredAt: occurredAt.toISOString()
	};
}

// The stored row read back, in the same statement as the insert (CTE `e`), in the shape every
// reader gets (entrySelect). A new entry has no retraction and no photo yet (both would point

/** Why the parse cannot be logged, or null when it can. */
export function refusal(parsed: ParsedPhrase, step: StepDefinition | null): string | null {
	switch (parsed.intent) {
		case 'note':
			return parsed.note ? null : (parsed.problems[0] ?? 'Say what to note after "note".');
		case 'part':
			return parsed.note ? null : (parsed.problems[0] ?? 'Say which part was fitted.');
		case 'done':
			return step ? null : (parsed.problems[0] ?? 'Say which step is done.');
		case 'history':
			return '"history …" shows a step\'s past readings on the Bench; it logs nothing.';
		case 'measure':
			if (!step) return parsed.problems[0] ?? 'No step of this job matches that phrase.';
			if (!parsed.quantity || parsed.verdict === null) {
				return parsed.problems[0] ?? `That value cannot be judged against ${step.label}.`;
			}
			return null;
		default:
			return (
				parsed.problems[0] ??
				'Benchcall could not read that phrase. Call out a step and a value, e.g. "rear axle 80 Nm".'
			);
	}
}
