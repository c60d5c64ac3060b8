// Appending to the job log (append-only): the phrase read again on the server, the state
// machine at the append, group commit for the common case, and the stored entry announced.
import { and, eq, sql } from 'drizzle-orm';
import { closedStates, stateLabels, type JobState } from '$lib/jobs/states';
import type { ParsedPhrase } from '$lib/phrase';
import { isUuid } from '$lib/ids';
import { dimensionOf } from '$lib/units';
import type { BenchStep, EntryView } from '$lib/bench/types';
import { beforeOpening, beforeOpeningMessage } from '$lib/schemas/dates';
import { failure, type Result } from '$lib/result';
import { db } from '../db';
import { isClosedRecord, isDatabaseUnavailable } from '../db/errors';
import * as s from '../db/schema';
import { transitionJob } from '../jobs';
import { mayWrite, NOT_FOUND, type Actor } from '../bench/job';
import {
	cachedStepSet,
	describeStep,
	jobStepDefinitions,
	listSteps,
	toStepSpecs,
	type StepSet
} from '../bench/steps';
import { listTools } from '../bench/tools';
import {
	entryTime,
	isLogged,
	newEntry,
	readPhrase,
	refusal,
	stepOf,
	type AppendInput,
	type BenchTool
} from './entry';
import { GroupCommit } from './group-commit';
import { existingEntry, toEntry } from './read';
import { retract } from './retract';
import { announceStored, closedMeanwhileMessage } from './write';
import { insertBatch, insertOne, type BatchRow } from './write-sql';
import { stepAdapter } from '$lib/torque/adapter';

/** The entry, `created` unless its id was stored before (a device's retry), or a refusal. */
export type AppendResult = Result<
	| { created: boolean; entry: EntryView }
	/** An intent that logs nothing ("next", "spec …"): answered, nothing written. */
	| { answer: { intent: 'next' | 'spec'; step: BenchStep | null; message: string } }
>;

const CLOSED_MEANWHILE = failure('conflict', closedMeanwhileMessage);
const notOnJob = () => failure('unprocessable', 'That step is not on this job.');

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
	if (!ctx) return failure('not_found', NOT_FOUND);
	knownTolerance.set(actor.shopId, ctx.pct);
	if (!mayWrite(actor, ctx.job)) {
		return failure(
			'forbidden',
			actor.role === 'technician'
				? 'This job is not assigned to you. Ask the foreman to assign it.'
				: 'Your role does not log work on jobs.'
		);
	}
	const closed = await closedJob(actor, jobId, ctx.job.state, input.id);
	if (closed) return closed;
	const result = await appendChecked(actor, ctx, input, now);
	// A repeat of a stored id answers with the stored entry, whatever the text reads as now. The
	// insert itself recognises a repeat (on conflict); any other outcome asks here.
	if (!('entry' in result)) {
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
	const cached = cachedStepSet(actor.shopId, jobId);
	if (pct === undefined || !cached || input.retracts || input.torqueToolId) return null;
	if (actor.role !== 'technician' && actor.role !== 'foreman' && actor.role !== 'owner')
		return null;
	let set: StepSet;
	try {
		set = await cached;
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
	const row = await together.add({
		...entry,
		stepsVersion: set.version,
		pct,
		anyJob: actor.role !== 'technician'
	});
	if (!row) return null;
	return stored(actor, jobId, row, row.job_state as JobState);
}

/** The common case's appends of one moment, written together (group-commit.ts). */
const together = new GroupCommit<BatchRow, Record<string, unknown>>(insertBatch, {
	limit: 200,
	failsAll: isDatabaseUnavailable
});

/** A stored entry: announced to the live hub, and the job put in work if it was open. */
async function stored(
	actor: Actor,
	jobId: string,
	row: Record<string, unknown>,
	state: JobState
): Promise<AppendResult> {
	const entry = toEntry(row);
	announceStored(actor.shopId, entry);
	if (state === 'open') await startWork(actor, jobId);
	return { ok: true, created: true, entry };
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
	if (!read) return notOnJob();
	const { parsed, deviceTime } = read;

	if (parsed.intent === 'next' || parsed.intent === 'spec') {
		// These log nothing and show the steps' done state, so read the steps as they are now.
		const live = await listSteps(actor.shopId, jobId);
		const again = readPhrase(toStepSpecs(live), pct, input, now, timeZone);
		return again ? answer(again.parsed, live) : notOnJob();
	}
	if (beforeOpening(entryTime(read, now), ctx.openedAt)) {
		return failure('unprocessable', beforeOpeningMessage);
	}
	if (parsed.intent === 'undo' || input.retracts) {
		return refusedIfClosed(retract(actor, job, input, deviceTime));
	}

	const step = stepOf(steps, parsed);
	const refused = refusal(parsed, step);
	if (refused) return failure('unprocessable', refused);

	let tool: BenchTool | null = null;
	const isTorque = step?.unit ? dimensionOf(step.unit) === 'torque' : false;
	if (input.torqueToolId && isTorque && parsed.intent === 'measure') {
		const found = (await listTools(actor.shopId, now)).find((t) => t.id === input.torqueToolId);
		if (!found) return failure('unprocessable', 'That torque tool is not in this shop’s list.');
		tool = { id: found.id, overdue: found.state === 'overdue', lengthMm: found.effectiveLengthMm };
	}

	const entry = newEntry(actor, jobId, input, read, step, tool, now);
	// One round trip: the insert, and the row.
	const inserted = await refusedIfClosed(insertOne(entry));
	if (!Array.isArray(inserted)) return inserted; // refused: the job closed meanwhile
	const [row] = inserted;
	if (!row) {
		return (
			(await existingEntry(actor.shopId, jobId, input.id)) ??
			failure('conflict', 'That entry id is already used.')
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
		return failure('unprocessable', parsed.problems[0] ?? 'No step of this job matches.');
	}
	return { ok: true, answer: { intent, step: shown, message: describeStep(shown, intent) } };
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
			(await existingEntry(actor.shopId, jobId, entryId)) ??
			failure(
				'conflict',
				`This job is ${stateLabels[state].toLowerCase()}: its record is closed and takes no more entries. Open a new job card for new work.`
			)
		);
	}
	if (state !== 'ready_to_invoice') return null;
	const back = await transitionJob(actor.shopId, jobId, 'in_work', {
		byUserId: actor.id,
		expectedFrom: 'ready_to_invoice',
		reason: 'Work found after the job was ready to invoice'
	});
	return back.ok ? null : failure('conflict', back.message);
}

/**
 * The first entry on an open job puts it in work, through transitionJob like any other state
 * change. Refused when someone moved the job meanwhile: the entry is stored either way.
 */
async function startWork(actor: Actor, jobId: string): Promise<void> {
	await transitionJob(actor.shopId, jobId, 'in_work', { byUserId: actor.id, expectedFrom: 'open' });
}
