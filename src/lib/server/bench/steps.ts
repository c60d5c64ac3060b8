// A job's steps: their done state (from the log's derived state), the phrase engine's view of
// them, and a per-process copy of their definitions between appends.
import { sql } from 'drizzle-orm';
import type { StepSpec, Verdict } from '$lib/phrase';
import type { AdapterDirection } from '$lib/torque/adapter';
import { formatQuantity } from '$lib/units';
import type { BenchStep, StepDefinition } from '$lib/bench/types';
import { toStepSpecs } from '$lib/bench/call';
import { db } from '../db';

/** The job's steps in order, each done once it has a live (not retracted) entry. */
export async function listSteps(shopId: string, jobId: string): Promise<BenchStep[]> {
	// Done and the latest verdict as job_step_state holds them (drizzle/0011): one definition for
	// the Bench, the state machine, the Jobs list and the Floor (a redo makes a step not done).
	const rows = await db.execute(sql`
		select st.id, st.position, st.label, st.aliases, st.unit, st.nominal, st.min, st.max, st.caution,
			st.fluid, st.adapter_length_mm, st.adapter_direction, jp.id as procedure_id, jp.name as procedure_name,
			coalesce(ss.done, false) as done, ss.latest_verdict as last_verdict
		from job_step st
		join job_procedure jp on jp.id = st.job_procedure_id and jp.shop_id = st.shop_id
		left join job_step_state ss on ss.shop_id = st.shop_id and ss.job_step_id = st.id
		where st.shop_id = ${shopId} and st.job_id = ${jobId}
		order by jp.position, st.position
	`);
	return rows.map((r) => ({
		...toStepDefinition(r),
		done: r.done as boolean,
		lastVerdict: (r.last_verdict as Verdict | null) ?? null
	}));
}

function toStepDefinition(r: Record<string, unknown>): StepDefinition {
	return {
		id: r.id as string,
		position: r.position as number,
		procedureId: r.procedure_id as string,
		procedureName: r.procedure_name as string,
		label: r.label as string,
		aliases: (r.aliases as string[] | null) ?? [],
		unit: r.unit as string | null,
		nominal: r.nominal as number | null,
		min: r.min as number | null,
		max: r.max as number | null,
		caution: r.caution as string | null,
		fluid: (r.fluid as string | null) ?? null,
		adapterLengthMm: (r.adapter_length_mm as number | null) ?? null,
		adapterDirection: (r.adapter_direction as AdapterDirection | null) ?? null
	};
}

// the phrase engine's shape of steps: one definition for the server and the Bench's page
export { toStepSpecs };

// --- the job's steps, kept in memory between appends ------------------------------------------
//
// Every append reads its phrase against the job's steps, and the phrase engine builds a search
// index per steps array (cached by the array's identity). Reading the steps and rebuilding that
// index on each append cost more than the insert itself, so each server process keeps the
// definitions of recently used jobs. `job.steps_version` is bumped by triggers whenever a job's
// steps or procedures change (drizzle/0005), by any writer; an append reads it with the job and
// re-reads the steps when it differs from the copy's. Done state is not kept: it changes with
// every entry, and only "next" and "spec" (which log nothing) need it.

export interface StepSet {
	version: number;
	steps: StepDefinition[];
	/** The phrase engine's view of `steps`; one array per version, so its index is built once. */
	specs: StepSpec[];
}

const stepSetLimit = 500;
const stepSets = new Map<string, { version: number; set: Promise<StepSet> }>();

async function readStepSet(shopId: string, jobId: string): Promise<StepSet> {
	const rows = await db.execute(sql`
		select j.steps_version, st.id, st.position, st.label, st.aliases, st.unit, st.nominal, st.min,
			st.max, st.caution, st.fluid, st.adapter_length_mm, st.adapter_direction, jp.id as procedure_id,
			jp.name as procedure_name
		from job j
		left join (job_step st join job_procedure jp on jp.id = st.job_procedure_id and jp.shop_id = st.shop_id)
			on st.job_id = j.id and st.shop_id = j.shop_id
		where j.shop_id = ${shopId} and j.id = ${jobId}
		order by jp.position, st.position
	`);
	const steps = rows.filter((r) => r.id !== null).map(toStepDefinition);
	return { version: Number(rows[0]?.steps_version ?? -1), steps, specs: toStepSpecs(steps) };
}

/**
 * The job's step definitions as of `version` or later (the version read with the job). Scoped
 * like every query: the copy is kept per shop and job.
 */
export function jobStepDefinitions(
	shopId: string,
	jobId: string,
	version: number
): Promise<StepSet> {
	const key = `${shopId}/${jobId}`;
	const hit = stepSets.get(key);
	if (hit && hit.version >= version) {
		stepSets.delete(key); // most recently used last; the oldest goes first when full
		stepSets.set(key, hit);
		return hit.set;
	}
	const set = readStepSet(shopId, jobId);
	const entry = { version, set };
	stepSets.set(key, entry);
	if (stepSets.size > stepSetLimit) stepSets.delete(stepSets.keys().next().value as string);
	// The copy is as new as the version it was read with (never older than the one asked for).
	set.then(
		(read) => {
			entry.version = Math.max(entry.version, read.version);
		},
		() => {
			if (stepSets.get(key) === entry) stepSets.delete(key);
		}
	);
	return set;
}

/** The copy this process holds of a job's steps, if any (the append's quick path). */
export function cachedStepSet(shopId: string, jobId: string): Promise<StepSet> | null {
	return stepSets.get(`${shopId}/${jobId}`)?.set ?? null;
}

function describeSpec(st: BenchStep): string {
	if (!st.unit) return 'checked without a value';
	const unit = st.unit;
	if (st.min !== null && st.max !== null)
		return `${formatQuantity(st.min, unit)} – ${formatQuantity(st.max, unit)}`;
	if (st.min !== null) return `at least ${formatQuantity(st.min, unit)}`;
	if (st.max !== null) return `at most ${formatQuantity(st.max, unit)}`;
	if (st.nominal !== null) return `${formatQuantity(st.nominal, unit)} (shop tolerance)`;
	return 'no spec';
}

/** What "next" or "spec …" answers, in words. */
export function describeStep(st: BenchStep | null, intent: 'next' | 'spec'): string {
	if (!st) return intent === 'next' ? 'Every step is done.' : 'No step of this job matches.';
	const head = intent === 'next' ? `Next: ${st.label}` : st.label;
	return `${head} — ${describeSpec(st)}${st.caution ? `. Caution: ${st.caution}` : ''}`;
}
