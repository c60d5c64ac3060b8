// The Bench's server side: a job's steps with their done state, the job log (append-only),
// retractions, torque tools and the hand-over to final inspection. All SQL is scoped by shop id;
// another shop's job reads as "no such job".
import { and, eq, sql } from 'drizzle-orm';
import type { Role } from '$lib/auth/roles';
import { withStep } from '$lib/bench/choose';
import { checkTransition } from '$lib/jobs/machine';
import { closedStates, stateLabels, type JobState } from '$lib/jobs/states';
import {
	parsePhrase,
	type FluidVerdict,
	type ParsedPhrase,
	type StepSpec,
	type Verdict
} from '$lib/phrase';
import { isUuid } from '$lib/ids';
import { calibrationDue } from '$lib/torque';
import {
	adapterFromMm,
	adapterInUse,
	signedLength,
	stepAdapter,
	wrenchSetting,
	type AdapterDirection
} from '$lib/torque/adapter';
import { dimensionOf, formatQuantity } from '$lib/units';
import type { BenchStep, EntryView, StepDefinition } from '$lib/bench/types';
import { announceEntry } from './announce';
import { client, db } from './db';
import { entrySelect, jobLogPageSql } from './entries-sql';
import { isClosedRecord, isDatabaseUnavailable } from './db/errors';
import {
	BACKDATE_BEFORE_OPENING_MS,
	beforeOpening,
	beforeOpeningMessage
} from '$lib/schemas/dates';
import { transitionJob } from './jobs';
import * as s from './db/schema';
import { closedPhotoMessage, storePhoto } from './photos';
import { uploads, type FileStorage } from './storage';
import { lastChecks } from './tool-checks';

export type { BenchStep, EntryView, StepDefinition };

/** How far ahead of the server's clock a device's time may be before it is clamped. */
export const CLOCK_SKEW_MS = 2 * 60_000;

export interface Actor {
	id: string;
	shopId: string;
	role: Role;
	name?: string;
}

export interface BenchJob {
	id: string;
	number: number;
	state: JobState;
	technicianId: string | null;
	technicianName: string | null;
	bay: string | null;
	concern: string;
	vehicle: string | null;
	registration: string | null;
	customerName: string | null;
}

export interface ToolView {
	id: string;
	identifier: string;
	kind: string;
	rangeMin: number;
	rangeMax: number;
	unit: string;
	dueDate: string | null;
	/** 'overdue' also when the tool's last check failed (`checkFailed`). */
	state: 'ok' | 'due_soon' | 'overdue';
	/** The date of the tool's last check when it failed; null otherwise. */
	checkFailed: string | null;
	/** For adapter settings; null when the owner has not given it. */
	effectiveLengthMm: number | null;
}

export type AppendResult =
	| { status: 200 | 201; entry: EntryView }
	/** An intent that logs nothing ("next", "spec …"): answered, nothing written. */
	| {
			status: 200;
			answer: { intent: 'next' | 'spec'; step: BenchStep | null; message: string };
	  }
	| { status: 403 | 404 | 409 | 422; message: string };

const NOT_FOUND = 'No such job.';
/** A close that won a race with the write (drizzle/0013 refused it in the inserting statement). */
const CLOSED_MEANWHILE = {
	status: 409 as const,
	message:
		'This job was closed meanwhile: its record takes no more entries. Open a new job card for new work.'
};

// --- jobs and steps ---------------------------------------------------------------------------

/** The job when it belongs to the shop; null otherwise (callers answer 404). */
export async function getJob(shopId: string, jobId: string): Promise<BenchJob | null> {
	if (!isUuid(jobId)) return null;
	const rows = await db.execute(sql`
		select j.id, j.number, j.state, j.technician_id, t.name as technician_name, j.bay, j.concern,
			nullif(trim(coalesce(v.make, '') || ' ' || coalesce(v.model, '')), '') as vehicle,
			v.registration, c.name as customer_name
		from job j
		left join "user" t on t.id = j.technician_id and t.shop_id = j.shop_id
		left join vehicle v on v.id = j.vehicle_id and v.shop_id = j.shop_id
		left join customer c on c.id = j.customer_id and c.shop_id = j.shop_id
		where j.shop_id = ${shopId} and j.id = ${jobId}
	`);
	return rows[0] ? toBenchJob(rows[0]) : null;
}

function toBenchJob(r: Record<string, unknown>): BenchJob {
	return {
		id: r.id as string,
		number: r.number as number,
		state: r.state as JobState,
		technicianId: r.technician_id as string | null,
		technicianName: r.technician_name as string | null,
		bay: r.bay as string | null,
		concern: r.concern as string,
		vehicle: r.vehicle as string | null,
		registration: r.registration as string | null,
		customerName: r.customer_name as string | null
	};
}

/** The job by its card number ("job 1042" in the call bar). */
export async function findJobIdByNumber(shopId: string, number: number): Promise<string | null> {
	if (!Number.isInteger(number) || number < 1 || number > 2_147_483_647) return null;
	const [row] = await db
		.select({ id: s.job.id })
		.from(s.job)
		.where(and(eq(s.job.shopId, shopId), eq(s.job.number, number)))
		.limit(1);
	return row?.id ?? null;
}

/** Technicians write only on jobs assigned to them; foreman and owner on any job of the shop. */
export function mayWrite(actor: Actor, job: Pick<BenchJob, 'technicianId'>): boolean {
	if (actor.role === 'foreman' || actor.role === 'owner') return true;
	return actor.role === 'technician' && job.technicianId === actor.id;
}

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

// --- the job's steps, kept in memory between appends ------------------------------------------
//
// Every append reads its phrase against the job's steps, and the phrase engine builds a search
// index per steps array (cached by the array's identity). Reading the steps and rebuilding that
// index on each append cost more than the insert itself, so each server process keeps the
// definitions of recently used jobs. `job.steps_version` is bumped by triggers whenever a job's
// steps or procedures change (drizzle/0005), by any writer; an append reads it with the job and
// re-reads the steps when it differs from the copy's. Done state is not kept: it changes with
// every entry, and only "next" and "spec" (which log nothing) need it.

interface StepSet {
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

export async function shopTolerance(shopId: string): Promise<{ pct: number; months: number }> {
	const [row] = await db
		.select({ pct: s.shop.defaultTolerancePct, months: s.shop.calibrationMonths })
		.from(s.shop)
		.where(eq(s.shop.id, shopId));
	return { pct: row?.pct ?? 10, months: row?.months ?? 12 };
}

// --- torque tools -----------------------------------------------------------------------------

function toolStatus(
	calibratedOn: string | null,
	months: number,
	today: Date
): { dueDate: string | null; state: ToolView['state'] } {
	// A tool never calibrated is treated as overdue: nothing vouches for its readings.
	if (!calibratedOn) return { dueDate: null, state: 'overdue' };
	try {
		const st = calibrationDue(calibratedOn, { months, today });
		return { dueDate: st.dueDate, state: st.state };
	} catch {
		return { dueDate: null, state: 'overdue' };
	}
}

/** The shop's active torque tools with their calibration state. */
export async function listTools(shopId: string, today = new Date()): Promise<ToolView[]> {
	const { months } = await shopTolerance(shopId);
	const checks = await lastChecks(shopId);
	const rows = await db
		.select()
		.from(s.torqueTool)
		.where(and(eq(s.torqueTool.shopId, shopId), eq(s.torqueTool.active, true)))
		.orderBy(s.torqueTool.identifier);
	return rows.map((t) => ({
		id: t.id,
		identifier: t.identifier,
		kind: t.kind,
		rangeMin: t.rangeMin,
		rangeMax: t.rangeMax,
		unit: t.unit,
		effectiveLengthMm: t.effectiveLengthMm,
		...failedOr(checks.get(t.id), toolStatus(t.calibratedOn, t.intervalMonths ?? months, today))
	}));
}

/** A failed last check marks the tool as an overdue calibration does (ISO 6789-2). */
function failedOr(
	last: { checkedOn: string; passed: boolean } | undefined,
	status: { dueDate: string | null; state: ToolView['state'] }
): Pick<ToolView, 'dueDate' | 'state' | 'checkFailed'> {
	if (last && !last.passed) return { ...status, state: 'overdue', checkFailed: last.checkedOn };
	return { ...status, checkFailed: null };
}

// --- the log ----------------------------------------------------------------------------------

function iso(v: unknown): string {
	return (v instanceof Date ? v : new Date(String(v))).toISOString();
}

function toEntry(r: Record<string, unknown>): EntryView {
	return {
		id: r.id as string,
		seq: Number(r.seq),
		jobId: r.job_id as string,
		stepId: r.job_step_id as string | null,
		stepLabel: r.step_label as string | null,
		authorId: r.author_id as string,
		authorName: r.author_name as string,
		kind: r.kind as EntryView['kind'],
		rawText: r.raw_text as string,
		source: r.source as EntryView['source'],
		value: r.value as number | null,
		unit: r.unit as string | null,
		specValue: r.spec_value as number | null,
		specUnit: r.spec_unit as string | null,
		specMin: r.spec_min as number | null,
		specMax: r.spec_max as number | null,
		specNominal: r.spec_nominal as number | null,
		verdict: r.verdict as Verdict | null,
		fluid: (r.fluid as string | null) ?? null,
		fluidVerdict: (r.fluid_verdict as FluidVerdict | null) ?? null,
		note: r.note as string | null,
		torqueToolId: r.torque_tool_id as string | null,
		torqueTool: r.torque_tool as string | null,
		toolCalibrationOverdue: Boolean(r.tool_calibration_overdue),
		adapterMm: (r.adapter_mm as number | null) ?? null,
		toolLengthMm: (r.tool_length_mm as number | null) ?? null,
		wrenchSetting: (r.wrench_setting as number | null) ?? null,
		wrenchSettingUnit: (r.wrench_setting_unit as string | null) ?? null,
		retracts: r.retracts as string | null,
		retractedBy: r.retracted_by_id
			? {
					id: r.retracted_by_id as string,
					authorName: r.retracted_by_name as string,
					at: iso(r.retracted_at)
				}
			: null,
		occurredAt: iso(r.occurred_at),
		recordedAt: iso(r.recorded_at),
		photos: (r.photos as { id: string; fileName: string }[] | null) ?? []
	};
}

async function readEntry(shopId: string, id: string): Promise<EntryView | null> {
	const rows = await db.execute(sql`${entrySelect} where e.shop_id = ${shopId} and e.id = ${id}`);
	return rows[0] ? toEntry(rows[0]) : null;
}

/**
 * A page of the job log, newest first. `before`: entries older than that seq (the next page);
 * `after`: entries newer than that seq (live catch-up).
 */
export async function listEntries(
	shopId: string,
	jobId: string,
	opts: { before?: number; after?: number; limit?: number } = {}
): Promise<{ entries: EntryView[]; nextBefore: number | null }> {
	const limit = Math.min(Math.max(Math.trunc(opts.limit ?? 50), 1), 200);
	const rows = await db.execute(
		jobLogPageSql(shopId, jobId, { before: opts.before, after: opts.after, limit: limit + 1 })
	);
	const entries = rows.slice(0, limit).map(toEntry);
	const more = rows.length > limit;
	return { entries, nextBefore: more ? entries[entries.length - 1].seq : null };
}

// --- appending --------------------------------------------------------------------------------

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

/**
 * What an append needs of the job, in one query: who may write, state, the steps' version and
 * the shop's tolerance. Prepared once (it runs on every append).
 */
const appendContextQuery = db
	.select({
		id: s.job.id,
		state: s.job.state,
		technicianId: s.job.technicianId,
		stepsVersion: s.job.stepsVersion,
		openedAt: s.job.createdAt,
		pct: s.shop.defaultTolerancePct,
		timeZone: s.shop.timeZone
	})
	.from(s.job)
	.innerJoin(s.shop, eq(s.shop.id, s.job.shopId))
	.where(and(eq(s.job.shopId, sql.placeholder('shopId')), eq(s.job.id, sql.placeholder('jobId'))))
	.prepare('append_context');

async function appendContext(shopId: string, jobId: string) {
	if (!isUuid(jobId)) return null;
	const [row] = await appendContextQuery.execute({ shopId, jobId });
	if (!row) return null;
	return {
		job: { id: row.id, state: row.state, technicianId: row.technicianId },
		openedAt: row.openedAt,
		stepsVersion: row.stepsVersion,
		pct: row.pct,
		timeZone: row.timeZone
	};
}

/** The shop's tolerance as last read by this process, for appendToKnownJob (which checks it). */
const knownTolerance = new Map<string, number>();

/**
 * Appends one entry, reading the text again with the phrase engine (its verdict is the one
 * stored). Idempotent by the device-made id: a repeat answers 200 with the stored entry.
 */
export async function appendEntry(
	actor: Actor,
	jobId: string,
	input: AppendInput,
	now = new Date()
): Promise<AppendResult> {
	const quick = await appendToKnownJob(actor, jobId, input, now);
	if (quick) return quick;
	const ctx = await appendContext(actor.shopId, jobId);
	if (!ctx) return { status: 404, message: NOT_FOUND };
	knownTolerance.set(actor.shopId, ctx.pct);
	if (!mayWrite(actor, ctx.job)) {
		return {
			status: 403,
			message:
				actor.role === 'technician'
					? 'This job is not assigned to you. Ask the foreman to assign it.'
					: 'Your role does not log work on jobs.'
		};
	}
	const closed = await closedJob(actor, jobId, ctx.job.state, input.id);
	if (closed) return closed;
	const result = await appendChecked(actor, ctx, input, now);
	// A repeat of a stored id answers with the stored entry, whatever the text reads as now. The
	// insert itself recognises a repeat (on conflict); any other outcome asks here.
	if (result.status !== 201 && !('entry' in result)) {
		return (await existingEntry(actor.shopId, jobId, input.id)) ?? result;
	}
	return result;
}

/**
 * The common case, in one statement shared with the appends of the same moment (group commit,
 * below). When this process has read the job before, its steps and the shop's tolerance are at
 * hand: the phrase is read against them, and the insert writes only if the job (of this shop)
 * still has that steps version and tolerance and the actor may write on it. Null when this is
 * not that case or the insert wrote nothing (a changed job, a repeated id, another shop's job):
 * appendEntry then decides everything from the database as it is now.
 */
async function appendToKnownJob(
	actor: Actor,
	jobId: string,
	input: AppendInput,
	now: Date
): Promise<AppendResult | null> {
	const pct = knownTolerance.get(actor.shopId);
	const cached = stepSets.get(`${actor.shopId}/${jobId}`);
	if (pct === undefined || !cached || input.retracts || input.torqueToolId) return null;
	if (actor.role !== 'technician' && actor.role !== 'foreman' && actor.role !== 'owner')
		return null;
	let set: StepSet;
	try {
		set = await cached.set;
	} catch {
		return null;
	}
	const read = readPhrase(set.specs, pct, input, now);
	// an adapter's setting needs the tool: the full path works it out and stores it
	if (!read || !isLogged(read.parsed.intent) || read.parsed.adapter) return null;
	if (input.adapterMm !== undefined && input.adapterMm !== null) return null;
	// "… at 10:30" is read in the shop's zone, which this path does not know: the full path has it
	if (read.parsed.occurredAt) return null;
	const step = stepOf(set.steps, read.parsed);
	if (refusal(read.parsed, step)) return null;
	// the step's own adapter is recorded like a said one: by the full path
	if (step && stepAdapter(step.adapterLengthMm, step.adapterDirection)) return null;
	const entry = newEntry(actor, jobId, input, read, step, null, now);
	const row = await appendTogether({
		...entry,
		stepsVersion: set.version,
		pct,
		anyJob: actor.role !== 'technician'
	});
	if (!row) return null;
	return stored(actor, jobId, row, row.job_state as JobState);
}

// --- group commit -------------------------------------------------------------------------------
//
// Appends that arrive in the same turn of the event loop are written by one statement at the end
// of that turn (setImmediate, no timer), and while that statement is on its way the next batch
// gathers: under load, PostgreSQL parses, plans and commits once for many entries instead of once
// each, this process sends one message instead of many, and batches do not contend with each
// other for the same pages. Under light load a batch holds one entry and waits for nothing.
// Each append still gets its own answer: its stored row, or null when its conditions did not
// hold (appendEntry then decides alone). All entries of a batch commit together or not at all;
// if the statement fails for a reason other than the database being away, every entry of the
// batch is tried again on its own, so one bad entry cannot fail the others.

interface BatchRow extends NewEntry {
	/** Written only while the job still has this steps version ... */
	stepsVersion: number;
	/** ... and its shop this tolerance ... */
	pct: number;
	/** ... and the author may write on any job of the shop, or the job is assigned to them. */
	anyJob: boolean;
}

interface Waiting {
	row: BatchRow;
	resolve: (row: Record<string, unknown> | null) => void;
	reject: (err: unknown) => void;
}

/** Entries per statement: a batch is one transaction, so keep it short. */
const batchLimit = 200;
let waiting: Waiting[] = [];
let flushScheduled = false;
/** A batch is on its way: the next one gathers meanwhile and goes when it is back. */
let writing = false;

function appendTogether(row: BatchRow): Promise<Record<string, unknown> | null> {
	// The same id twice in one batch (a device repeating itself at once): the second goes alone.
	if (waiting.some((w) => w.row.id === row.id)) return Promise.resolve(null);
	return new Promise((resolve, reject) => {
		waiting.push({ row, resolve, reject });
		scheduleFlush();
	});
}

function scheduleFlush() {
	if (flushScheduled || writing || waiting.length === 0) return;
	flushScheduled = true;
	setImmediate(flushAppends);
}

function flushAppends() {
	flushScheduled = false;
	if (writing) return;
	const batch = waiting.slice(0, batchLimit);
	waiting = waiting.slice(batchLimit);
	writing = true;
	void writeBatch(batch).finally(() => {
		writing = false;
		scheduleFlush();
	});
}

async function writeBatch(batch: Waiting[]) {
	let rows: Record<string, unknown>[];
	try {
		rows = await client`
			with r as (
				select * from json_to_recordset(${JSON.stringify(batch.map((w) => w.row))}::json) as r(
					"id" uuid, "shopId" uuid, "jobId" uuid, "jobStepId" uuid, "authorId" uuid,
					"kind" entry_kind, "rawText" text, "source" entry_source, "value" float8, "unit" text,
					"specValue" float8, "specUnit" text, "verdict" verdict, "fluid" text,
					"fluidVerdict" text, "note" text,
					"torqueToolId" uuid, "overdue" boolean, "occurredAt" timestamptz,
					"stepsVersion" integer, "pct" float8, "anyJob" boolean)
			), ok as (
				select r.*, j.state as job_state
				from r
				join job j on j.id = r."jobId" and j.shop_id = r."shopId"
					and j.state in ('open', 'in_work', 'final_inspection', 'on_hold')
					and j.steps_version = r."stepsVersion" and (r."anyJob" or j.technician_id = r."authorId")
					and r."occurredAt" >= j.created_at - ${BACKDATE_BEFORE_OPENING_MS} * interval '1 millisecond'
				join shop sh on sh.id = j.shop_id and sh.default_tolerance_pct = r.pct
			), e as (
				insert into log_entry (id, shop_id, job_id, job_step_id, author_id, kind, raw_text, source,
					value, unit, spec_value, spec_unit, verdict, fluid, fluid_verdict, note, torque_tool_id,
					tool_calibration_overdue, occurred_at)
				select "id", "shopId", "jobId", "jobStepId", "authorId", "kind", "rawText", "source",
					"value", "unit", "specValue", "specUnit", "verdict", "fluid", "fluidVerdict", "note",
					"torqueToolId", "overdue", "occurredAt"
				from ok
				-- Each entry locks its job's chain head (drizzle/0010): one order for all batches.
				order by "jobId"
				on conflict (id) do nothing
				returning *
			)
			${readBack}, ok.job_state ${readBackFrom} join ok on ok.id = e.id`;
	} catch (err) {
		if (isDatabaseUnavailable(err)) for (const w of batch) w.reject(err);
		else for (const w of batch) w.resolve(null);
		return;
	}
	const byId = new Map(rows.map((row) => [row.id as string, row]));
	for (const w of batch) w.resolve(byId.get(w.row.id) ?? null);
}

/** Intents that write an entry of their own kind. */
function isLogged(intent: ParsedPhrase['intent']): intent is NewEntry['kind'] {
	return intent === 'measure' || intent === 'part' || intent === 'note' || intent === 'done';
}

/**
 * The phrase read against the job's steps; null when the picked step is not on the job. A time
 * in the phrase ("… at 10:30") is the shop's clock time on the day the entry was typed.
 */
function readPhrase(
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

function stepOf<T extends { id: string }>(steps: T[], parsed: ParsedPhrase): T | null {
	return parsed.stepId ? (steps.find((st) => st.id === parsed.stepId) ?? null) : null;
}

interface NewEntry {
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
function entryTime(read: { parsed: ParsedPhrase; deviceTime: Date }, now: Date): Date {
	return read.parsed.occurredAt
		? clampTime(new Date(read.parsed.occurredAt), now)
		: clampTime(read.deviceTime, now);
}

/** The torque tool an entry is made with, as the append sees it. */
interface BenchTool {
	id: string;
	overdue: boolean;
	lengthMm: number | null;
}

function newEntry(
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
// at it by a foreign key), so those are constants here.
const readBack = client`
	select e.id, e.seq, e.job_id, e.job_step_id, st.label as step_label, e.author_id,
		a.name as author_name, e.kind, e.raw_text, e.source, e.value, e.unit, e.spec_value,
		e.spec_unit, st.min as spec_min, st.max as spec_max, st.nominal as spec_nominal, e.verdict,
		e.fluid, e.fluid_verdict, e.note, e.torque_tool_id, tt.identifier as torque_tool, e.tool_calibration_overdue,
		e.adapter_mm, e.tool_length_mm, e.wrench_setting, e.wrench_setting_unit,
		e.retracts, e.occurred_at, e.recorded_at, null as retracted_by_id,
		null as retracted_by_name, null as retracted_at, '[]'::json as photos`;
const readBackFrom = client`
	from e
	join "user" a on a.id = e.author_id
	left join job_step st on st.id = e.job_step_id and st.shop_id = e.shop_id
	left join torque_tool tt on tt.id = e.torque_tool_id and tt.shop_id = e.shop_id`;

/** A stored entry: announced to the live hub, and the job put in work if it was open. */
async function stored(
	actor: Actor,
	jobId: string,
	row: Record<string, unknown>,
	state: JobState
): Promise<AppendResult> {
	const entry = toEntry(row);
	void announceEntry({
		seq: entry.seq,
		id: entry.id,
		shopId: actor.shopId,
		jobId,
		kind: entry.kind
	});
	if (state === 'open') await startWork(actor, jobId);
	return { status: 201, entry };
}

async function appendChecked(
	actor: Actor,
	ctx: NonNullable<Awaited<ReturnType<typeof appendContext>>>,
	input: AppendInput,
	now: Date
): Promise<AppendResult> {
	const { job, pct, timeZone } = ctx;
	const jobId = job.id;
	const { steps, specs } = await jobStepDefinitions(actor.shopId, jobId, ctx.stepsVersion);
	const read = readPhrase(specs, pct, input, now, timeZone);
	if (!read) return { status: 422, message: 'That step is not on this job.' };
	const { parsed, deviceTime } = read;

	if (parsed.intent === 'next' || parsed.intent === 'spec') {
		// These log nothing and show the steps' done state, so read the steps as they are now.
		const live = await listSteps(actor.shopId, jobId);
		const again = readPhrase(toStepSpecs(live), pct, input, now, timeZone);
		return again
			? answer(again.parsed, live)
			: { status: 422, message: 'That step is not on this job.' };
	}
	if (beforeOpening(entryTime(read, now), ctx.openedAt)) {
		return { status: 422, message: beforeOpeningMessage };
	}
	if (parsed.intent === 'undo' || input.retracts) {
		return refusedIfClosed(retract(actor, job, input, deviceTime));
	}

	const step = stepOf(steps, parsed);
	const refused = refusal(parsed, step);
	if (refused) return { status: 422, message: refused };

	let tool: BenchTool | null = null;
	const isTorque = step?.unit ? dimensionOf(step.unit) === 'torque' : false;
	if (input.torqueToolId && isTorque && parsed.intent === 'measure') {
		const found = (await listTools(actor.shopId, now)).find((t) => t.id === input.torqueToolId);
		if (!found) return { status: 422, message: 'That torque tool is not in this shop’s list.' };
		tool = { id: found.id, overdue: found.state === 'overdue', lengthMm: found.effectiveLengthMm };
	}

	const entry = newEntry(actor, jobId, input, read, step, tool, now);
	// One round trip, prepared (postgres.js keeps it per connection): the insert, and the row.
	const inserted = await refusedIfClosed(client`
		with e as (
			insert into log_entry (id, shop_id, job_id, job_step_id, author_id, kind, raw_text, source,
				value, unit, spec_value, spec_unit, verdict, fluid, fluid_verdict, note, torque_tool_id,
				tool_calibration_overdue, adapter_mm, tool_length_mm, wrench_setting, wrench_setting_unit,
				occurred_at)
			values (${entry.id}, ${entry.shopId}, ${entry.jobId}, ${entry.jobStepId}, ${entry.authorId},
				${entry.kind}, ${entry.rawText}, ${entry.source}, ${entry.value}, ${entry.unit},
				${entry.specValue}, ${entry.specUnit}, ${entry.verdict}, ${entry.fluid},
				${entry.fluidVerdict}, ${entry.note},
				${entry.torqueToolId}, ${entry.overdue}, ${entry.adapterMm}, ${entry.toolLengthMm},
				${entry.wrenchSetting}, ${entry.wrenchSettingUnit}, ${entry.occurredAt})
			on conflict (id) do nothing
			returning *
		)
		${readBack} ${readBackFrom}`);
	if (!Array.isArray(inserted)) return inserted; // refused: the job closed meanwhile
	const [row] = inserted;
	if (!row) {
		return (
			(await existingEntry(actor.shopId, jobId, input.id)) ?? {
				status: 409,
				message: 'That entry id is already used.'
			}
		);
	}
	return stored(actor, jobId, row, job.state);
}

/** A write refused by drizzle/0013 (a close won the race) answers 409 with words. */
async function refusedIfClosed<T>(write: PromiseLike<T>): Promise<T | typeof CLOSED_MEANWHILE> {
	try {
		return await write;
	} catch (err) {
		if (isClosedRecord(err)) return CLOSED_MEANWHILE;
		throw err;
	}
}

/** The answer to "next" or "spec …": the step with its spec and caution; nothing is written. */
function answer(parsed: ParsedPhrase, steps: BenchStep[]): AppendResult {
	const intent = parsed.intent as 'next' | 'spec';
	const step = parsed.stepId ? (steps.find((st) => st.id === parsed.stepId) ?? null) : null;
	const shown = intent === 'next' ? (steps.find((st) => !st.done) ?? null) : step;
	if (intent === 'spec' && !shown) {
		return { status: 422, message: parsed.problems[0] ?? 'No step of this job matches.' };
	}
	return { status: 200, answer: { intent, step: shown, message: describeStep(shown, intent) } };
}

/**
 * The state machine at the append: a closed job refuses entries with a 409 (a device's retry of
 * an entry already stored still gets it back); on a job ready to invoice, work found sends the
 * job back to in work first (recorded with a reason), so it is in the foreman's view again
 * before anything is invoiced. Null when the append may go on.
 */
async function closedJob(
	actor: Actor,
	jobId: string,
	state: JobState,
	entryId: string
): Promise<AppendResult | null> {
	if (closedStates.includes(state)) {
		return (
			(await existingEntry(actor.shopId, jobId, entryId)) ?? {
				status: 409,
				message: `This job is ${stateLabels[state].toLowerCase()}: its record is closed and takes no more entries. Open a new job card for new work.`
			}
		);
	}
	if (state !== 'ready_to_invoice') return null;
	const back = await transitionJob(actor.shopId, jobId, 'in_work', {
		byUserId: actor.id,
		expectedFrom: 'ready_to_invoice',
		reason: 'Work found after the job was ready to invoice'
	});
	return back.ok ? null : { status: 409, message: back.message };
}

/** The first entry on an open job puts it in work, recorded like any other state change. */
async function startWork(actor: Actor, jobId: string): Promise<void> {
	await db.transaction(async (tx) => {
		const moved = await tx
			.update(s.job)
			.set({ state: 'in_work' })
			.where(and(eq(s.job.shopId, actor.shopId), eq(s.job.id, jobId), eq(s.job.state, 'open')))
			.returning({ id: s.job.id });
		if (moved.length === 0) return;
		await tx.insert(s.jobStateChange).values({
			shopId: actor.shopId,
			jobId,
			fromState: 'open',
			toState: 'in_work',
			byUserId: actor.id
		});
	});
}

/** Why the parse cannot be logged, or null when it can. */
function refusal(parsed: ParsedPhrase, step: StepDefinition | null): string | null {
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

/** A repeat of an id: the stored entry when it is this job's, a 409 when the id is taken. */
async function existingEntry(
	shopId: string,
	jobId: string,
	id: string
): Promise<AppendResult | null> {
	const [row] = await db
		.select({ shopId: s.logEntry.shopId, jobId: s.logEntry.jobId })
		.from(s.logEntry)
		.where(eq(s.logEntry.id, id))
		.limit(1);
	if (!row) return null;
	if (row.shopId !== shopId || row.jobId !== jobId) {
		return { status: 409, message: 'That entry id is already used.' };
	}
	const entry = await readEntry(shopId, id);
	return entry
		? { status: 200, entry }
		: { status: 409, message: 'That entry id is already used.' };
}

/**
 * Appends a retraction: of the author's own last live entry ("undo"), or of a named entry
 * (its author, or a foreman or owner). Serialized per job so two undos never pick the same one.
 */
async function retract(
	actor: Actor,
	job: Pick<BenchJob, 'id'>,
	input: AppendInput,
	occurredAt: Date
): Promise<AppendResult> {
	const outcome = await db.transaction(async (tx) => {
		await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${'retract:' + job.id}))`);
		const live = sql`e.shop_id = ${actor.shopId} and e.job_id = ${job.id}
			and e.kind <> 'retraction'
			and not exists (select 1 from log_entry r where r.retracts = e.id and r.shop_id = ${actor.shopId})`;
		let targetRows;
		if (input.retracts) {
			targetRows = await tx.execute(sql`
				select e.id, e.author_id, (${live}) as live from log_entry e
				where e.shop_id = ${actor.shopId} and e.job_id = ${job.id} and e.id = ${input.retracts}`);
			const t = targetRows[0];
			if (!t) return { status: 422 as const, message: 'There is no such entry on this job.' };
			const mine = t.author_id === actor.id;
			if (!mine && actor.role !== 'foreman' && actor.role !== 'owner') {
				return {
					status: 403 as const,
					message: 'Only its author or a foreman may retract an entry.'
				};
			}
			if (!t.live) {
				return { status: 422 as const, message: 'That entry is already retracted.' };
			}
		} else {
			targetRows = await tx.execute(sql`
				select e.id from log_entry e where ${live} and e.author_id = ${actor.id}
				order by e.seq desc limit 1`);
			if (!targetRows[0]) {
				return { status: 422 as const, message: 'You have no entry on this job left to undo.' };
			}
		}
		const target = targetRows[0].id as string;
		const inserted = await tx
			.insert(s.logEntry)
			.values({
				id: input.id,
				shopId: actor.shopId,
				jobId: job.id,
				authorId: actor.id,
				kind: 'retraction',
				rawText: input.text,
				source: input.source,
				retracts: target,
				occurredAt
			})
			.onConflictDoNothing({ target: s.logEntry.id })
			.returning({ seq: s.logEntry.seq });
		return inserted.length ? { status: 201 as const, seq: inserted[0].seq } : null;
	});
	if (outcome === null) {
		return (
			(await existingEntry(actor.shopId, job.id, input.id)) ?? {
				status: 409,
				message: 'That entry id is already used.'
			}
		);
	}
	if (outcome.status !== 201) return outcome;
	void announceEntry({
		seq: outcome.seq,
		id: input.id,
		shopId: actor.shopId,
		jobId: job.id,
		kind: 'retraction'
	});
	const entry = await readEntry(actor.shopId, input.id);
	return { status: 201, entry: entry! };
}

// --- final inspection -------------------------------------------------------------------------

export type HandOverResult =
	{ ok: true; state: JobState } | { ok: false; status: 403 | 404 | 409 | 422; message: string };

/**
 * in_work → final_inspection, recorded in job_state_change with who and when. When steps are
 * not all done a reason is required (it is kept on the job and in the change).
 */
export async function sendToFinalInspection(
	actor: Actor,
	jobId: string,
	reason?: string
): Promise<HandOverResult> {
	const job = await getJob(actor.shopId, jobId);
	if (!job) return { ok: false, status: 404, message: NOT_FOUND };
	if (!mayWrite(actor, job)) {
		return { ok: false, status: 403, message: 'This job is not assigned to you.' };
	}
	const steps = await listSteps(actor.shopId, jobId);
	const check = checkTransition(
		job.state,
		'final_inspection',
		{ stepsTotal: steps.length, stepsDone: steps.filter((st) => st.done).length },
		reason
	);
	if (!check.ok) {
		return { ok: false, status: job.state === 'in_work' ? 422 : 409, message: check.message };
	}
	return db.transaction(async (tx) => {
		const updated = await tx
			.update(s.job)
			.set({ state: 'final_inspection', stateReason: reason ?? null })
			.where(and(eq(s.job.shopId, actor.shopId), eq(s.job.id, jobId), eq(s.job.state, 'in_work')))
			.returning({ id: s.job.id });
		if (updated.length === 0) {
			return { ok: false as const, status: 409 as const, message: 'The job changed meanwhile.' };
		}
		await tx.insert(s.jobStateChange).values({
			shopId: actor.shopId,
			jobId,
			fromState: 'in_work',
			toState: 'final_inspection',
			reason: reason ?? null,
			byUserId: actor.id
		});
		return { ok: true as const, state: 'final_inspection' as const };
	});
}

/** Open jobs for the Bench's picker: a technician's own, or every active one for a foreman. */
export async function benchJobs(actor: Actor): Promise<BenchJob[]> {
	const mine = actor.role === 'technician' ? sql`and j.technician_id = ${actor.id}` : sql``;
	const rows = await db.execute(sql`
		select j.id, j.number, j.state, j.technician_id, t.name as technician_name, j.bay, j.concern,
			nullif(trim(coalesce(v.make, '') || ' ' || coalesce(v.model, '')), '') as vehicle,
			v.registration, c.name as customer_name
		from job j
		left join "user" t on t.id = j.technician_id and t.shop_id = j.shop_id
		left join vehicle v on v.id = j.vehicle_id and v.shop_id = j.shop_id
		left join customer c on c.id = j.customer_id and c.shop_id = j.shop_id
		where j.shop_id = ${actor.shopId} and j.state in ('open', 'in_work', 'final_inspection', 'on_hold')
		${mine}
		order by (j.state = 'in_work') desc, j.number desc
	`);
	return rows.map(toBenchJob);
}

// --- photos -----------------------------------------------------------------------------------

export type PhotoResult =
	{ status: 201; entry: EntryView } | { status: 400 | 403 | 404 | 409; message: string };

/** Attaches a photo to an entry of the job: type checked from the bytes, at most 10 MB. */
export async function attachPhoto(
	actor: Actor,
	jobId: string,
	entryId: string,
	file: { bytes: Uint8Array; name: string },
	storage: FileStorage = uploads()
): Promise<PhotoResult> {
	const job = await getJob(actor.shopId, jobId);
	if (!job) return { status: 404, message: NOT_FOUND };
	if (!mayWrite(actor, job)) return { status: 403, message: 'This job is not assigned to you.' };
	if (closedStates.includes(job.state)) return { status: 409, message: closedPhotoMessage };
	if (!isUuid(entryId)) return { status: 404, message: 'No such entry on this job.' };
	const [entry] = await db
		.select({ id: s.logEntry.id })
		.from(s.logEntry)
		.where(
			and(
				eq(s.logEntry.shopId, actor.shopId),
				eq(s.logEntry.jobId, jobId),
				eq(s.logEntry.id, entryId)
			)
		);
	if (!entry) return { status: 404, message: 'No such entry on this job.' };
	const stored = await storePhoto(
		{ shopId: actor.shopId, jobId, entryId, uploadedBy: actor.id },
		file,
		storage
	);
	if (!stored.ok) return { status: stored.closed ? 409 : 400, message: stored.message };
	return { status: 201, entry: (await readEntry(actor.shopId, entryId))! };
}

/** A stored photo of the shop, or null (another shop's photo reads as missing). */
export async function readPhoto(
	shopId: string,
	id: string,
	storage: FileStorage = uploads()
): Promise<{ mime: string; bytes: Uint8Array } | null> {
	if (!isUuid(id)) return null;
	const [row] = await db
		.select({ mime: s.attachment.mime, key: s.attachment.storageKey })
		.from(s.attachment)
		.where(and(eq(s.attachment.shopId, shopId), eq(s.attachment.id, id)));
	if (!row) return null;
	const bytes = await storage.get(row.key);
	return bytes ? { mime: row.mime, bytes } : null;
}
