// The Bench's hand-over: in work → final inspection, through the job state machine.
import type { JobState } from '$lib/jobs/states';
import { failure, type Result } from '$lib/result';
import { transitionJob } from '../jobs';
import { getJob, mayWrite, NOT_FOUND, type Actor } from './job';

export type HandOverResult = Result<{ state: JobState }>;

/**
 * in_work → final_inspection through transitionJob, which records who, when and why in
 * job_state_change. When steps are not all done a reason is required (it is kept on the job
 * and in the change): refused as `unprocessable`; from any other state as `conflict`.
 */
export async function sendToFinalInspection(
	actor: Actor,
	jobId: string,
	reason?: string
): Promise<HandOverResult> {
	const job = await getJob(actor.shopId, jobId);
	if (!job) return failure('not_found', NOT_FOUND);
	if (!mayWrite(actor, job)) return failure('forbidden', 'This job is not assigned to you.');
	const moved = await transitionJob(actor.shopId, jobId, 'final_inspection', {
		byUserId: actor.id,
		reason,
		expectedFrom: job.state
	});
	return moved.ok ? { ok: true, state: moved.to } : moved;
}
