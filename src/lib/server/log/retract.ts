// Retraction: a correction is a new entry naming the entry it withdraws (the log is append-only).
import { sql } from 'drizzle-orm';
import type { Actor, BenchJob } from '../bench/job';
import type { AppendResult } from './append';
import type { AppendInput } from './entry';
import { failure } from '$lib/result';
import { existingEntry, readEntry } from './read';
import { isLive } from './live';
import { closedMeanwhileMessage, writeEntries } from './write';

/**
 * Appends a retraction: of the author's own last live entry ("undo"), or of a named entry
 * (its author, or a foreman or owner). Serialized per job so two undos never pick the same one.
 */
export async function retract(
	actor: Actor,
	job: Pick<BenchJob, 'id'>,
	input: AppendInput,
	occurredAt: Date
): Promise<AppendResult> {
	const written = await writeEntries(async (insert, tx) => {
		await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${'retract:' + job.id}))`);
		const live = sql`e.shop_id = ${actor.shopId} and e.job_id = ${job.id}
			and e.kind <> 'retraction'
			and ${isLive('e')}`;
		let targetRows;
		if (input.retracts) {
			targetRows = await tx.execute(sql`
				select e.id, e.author_id, (${live}) as live from log_entry e
				where e.shop_id = ${actor.shopId} and e.job_id = ${job.id} and e.id = ${input.retracts}`);
			const t = targetRows[0];
			if (!t) return failure('unprocessable', 'There is no such entry on this job.');
			const mine = t.author_id === actor.id;
			if (!mine && actor.role !== 'foreman' && actor.role !== 'owner') {
				return failure('forbidden', 'Only its author or a foreman may retract an entry.');
			}
			if (!t.live) {
				return failure('unprocessable', 'That entry is already retracted.');
			}
		} else {
			targetRows = await tx.execute(sql`
				select e.id from log_entry e where ${live} and e.author_id = ${actor.id}
				order by e.seq desc limit 1`);
			if (!targetRows[0]) {
				return failure('unprocessable', 'You have no entry on this job left to undo.');
			}
		}
		const target = targetRows[0].id as string;
		const inserted = await insert({
			id: input.id,
			shopId: actor.shopId,
			jobId: job.id,
			authorId: actor.id,
			kind: 'retraction',
			rawText: input.text,
			source: input.source,
			retracts: target,
			occurredAt
		});
		return inserted ? { ok: true as const } : null;
	});
	if (written.closed) return failure('conflict', closedMeanwhileMessage);
	const outcome = written.value;
	if (outcome === null) {
		return (
			(await existingEntry(actor.shopId, job.id, input.id)) ??
			failure('conflict', 'That entry id is already used.')
		);
	}
	if (!outcome.ok) return outcome;
	const entry = await readEntry(actor.shopId, input.id);
	return { ok: true, created: true, entry: entry! };
}
