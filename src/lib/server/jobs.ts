// Job cards of one shop, with their progress. Every query is scoped by shop id.
import { and, eq, sql } from 'drizzle-orm';
import { checkTransition, type TransitionFacts } from '$lib/jobs/machine';
import { failure, type Result } from '$lib/result';
import type { JobState } from '$lib/jobs/states';
import type { JobRow } from '$lib/jobs/table';
import { db, type Tx } from './db';
import { job, jobStateChange } from './db/schema';
import { listJobsSql, type JobListFilter } from './jobs-sql';

/** A row of the jobs list ($lib/jobs/table.ts), with what the Floor also shows. */
export interface JobSummary extends JobRow {
	stateReason: string | null;
	/** Out-of-spec steps with no answer yet (the Floor's queue). */
	waiting: number;
	lastEntryAt: Date | null;
}

/**
 * Jobs with progress: a step is done once it has an entry that is not retracted (and no redo
 * after it); the out-of-spec count is of steps whose latest measurement (not retracted) is under
 * or over. Read from the state kept current at each append (drizzle/0011), so the cost follows
 * the jobs listed, not the length of their logs.
 */
export async function listJobs(shopId: string, filter: JobListFilter = {}): Promise<JobSummary[]> {
	const rows = await db.execute(listJobsSql(shopId, filter));
	return rows.map((r) => ({
		id: r.id as string,
		number: r.number as number,
		state: r.state as JobState,
		stateReason: r.state_reason as string | null,
		bay: r.bay as string | null,
		concern: r.concern as string,
		createdAt: new Date(r.created_at as string),
		technicianId: r.technician_id as string | null,
		technicianName: r.technician_name as string | null,
		customerName: r.customer_name as string | null,
		registration: r.registration as string | null,
		vehicle: r.vehicle as string | null,
		stepsTotal: r.steps_total as number,
		stepsDone: r.steps_done as number,
		outOfSpec: r.out_of_spec as number,
		waiting: r.waiting as number,
		lastEntryAt: r.last_entry_at ? new Date(r.last_entry_at as string) : null
	}));
}

/**
 * Refused as `not_found` (no such job in the shop), `conflict` (the job's state does not allow
 * the move, or changed meanwhile) or `unprocessable` (the move exists but a reason or a guard
 * fact is missing).
 */
export type TransitionResult = Result<{ from: JobState; to: JobState }>;

export interface TransitionOptions {
	/** Who makes the change (recorded in job_state_change). */
	byUserId: string;
	/** Required for hold, cancel, a move back, or final inspection with steps open. */
	reason?: string | null;
	/** Facts the caller knows better (e.g. the Floor's sign-off); the rest are read here. */
	facts?: Partial<TransitionFacts>;
	/** Refuse when the job is no longer in this state (someone else moved it meanwhile). */
	expectedFrom?: JobState;
	/** Run inside the caller's transaction, so its own writes and the change land together. */
	tx?: Tx;
}

/** The guard facts of one job, read in the transaction that changes it. */
export async function transitionFacts(
	shopId: string,
	jobId: string,
	tx: Tx | typeof db = db
): Promise<TransitionFacts> {
	// Done steps and out-of-spec entries waiting for an answer as job_step_state holds them
	// (drizzle/0011, kept in the appending transaction): the same definition the Bench, the Jobs
	// list and the Floor read.
	const [row] = await tx.execute(sql`
		select
			(select count(*) from job_step s where s.shop_id = ${shopId} and s.job_id = ${jobId})::int as steps_total,
			(select count(*) from job_step_state x
				where x.shop_id = ${shopId} and x.job_id = ${jobId} and x.done)::int as steps_done,
			(select count(*) from job_step_state x
				where x.shop_id = ${shopId} and x.job_id = ${jobId} and x.waiting)::int as open_out_of_spec,
			(select signed_off_at is not null from job where id = ${jobId} and shop_id = ${shopId}) as signed_off,
			(select from_state from job_state_change c
				where c.job_id = ${jobId} and c.shop_id = ${shopId} and c.to_state = 'on_hold'
				order by c.at desc limit 1) as held_from
	`);
	return {
		stepsTotal: (row?.steps_total as number) ?? 0,
		stepsDone: (row?.steps_done as number) ?? 0,
		openOutOfSpec: (row?.open_out_of_spec as number) ?? 0,
		signedOff: Boolean(row?.signed_off),
		heldFrom: (row?.held_from as JobState | null) ?? null
	};
}

/**
 * Moves a job to another state when the state machine allows it, and records who, when and
 * why in job_state_change in the same transaction. The job row is locked while deciding, so
 * two people moving the same job at once cannot both succeed from the same state.
 */
export async function transitionJob(
	shopId: string,
	jobId: string,
	to: JobState,
	opts: TransitionOptions
): Promise<TransitionResult> {
	const run = async (tx: Tx): Promise<TransitionResult> => {
		const [current] = await tx
			.select({ state: job.state })
			.from(job)
			.where(and(eq(job.shopId, shopId), eq(job.id, jobId)))
			.for('update');
		if (!current) return failure('not_found', 'No such job card in this shop.');
		const from = current.state;
		if (opts.expectedFrom && opts.expectedFrom !== from) {
			return failure(
				'conflict',
				'Someone else changed this job’s state meanwhile: look again and retry.'
			);
		}
		const facts = { ...(await transitionFacts(shopId, jobId, tx)), ...opts.facts };
		const reason = opts.reason?.trim() || null;
		const check = checkTransition(from, to, facts, reason);
		if (!check.ok)
			return failure(moveExists(from, to) ? 'unprocessable' : 'conflict', check.message);
		await tx
			.update(job)
			.set({ state: to, stateReason: reason })
			.where(and(eq(job.shopId, shopId), eq(job.id, jobId)));
		await tx
			.insert(jobStateChange)
			.values({ shopId, jobId, fromState: from, toState: to, reason, byUserId: opts.byUserId });
		return { ok: true, from, to };
	};
	return opts.tx ? run(opts.tx) : db.transaction(run);
}

/** Whether the machine has the move `from → to` at all, given every fact and a reason. */
function moveExists(from: JobState, to: JobState): boolean {
	const all: TransitionFacts = {
		stepsTotal: 0,
		stepsDone: 0,
		signedOff: true,
		openOutOfSpec: 0,
		heldFrom: to
	};
	return checkTransition(from, to, all, 'reason given').ok;
}

/** A job's state changes, newest first, with who made them. */
export async function stateHistory(shopId: string, jobId: string) {
	const rows = await db.execute(sql`
		select c.id, c.from_state, c.to_state, c.reason, c.at, u.name as by_name
		from job_state_change c left join "user" u on u.id = c.by_user_id
		where c.shop_id = ${shopId} and c.job_id = ${jobId}
		order by c.at desc, c.id
	`);
	return rows.map((r) => ({
		id: r.id as string,
		fromState: r.from_state as JobState | null,
		toState: r.to_state as JobState,
		reason: r.reason as string | null,
		at: new Date(r.at as string),
		byName: r.by_name as string | null
	}));
}
