// The one writer of the job log: every entry the app inserts is announced to the live hubs
// after its transaction commits (announce.ts says why not from a trigger). The Bench's hot paths
// insert with their own statements (write-sql.ts: one round trip with the row read back) and
// hand the stored row to `announceStored`; everything else inserts through `writeEntries`.
import { announceEntry } from '../announce';
import { db, type Tx } from '../db';
import { isClosedRecord } from '../db/errors';
import * as s from '../db/schema';

/** A close that won a race with the write (drizzle/0013 refused it in the inserting statement). */
export const closedMeanwhileMessage =
	'This job was closed meanwhile: its record takes no more entries. Open a new job card for new work.';

export type LogEntryValues = typeof s.logEntry.$inferInsert;

/** Inserts one entry in the transaction; null when its id is stored already. */
export type InsertEntry = (values: LogEntryValues) => Promise<{ id: string; seq: number } | null>;

/**
 * Runs `work` in one transaction; each entry it inserts through `insert` is announced once the
 * transaction has committed (nothing is announced when it rolls back). A write refused because
 * the job's record closed meanwhile (drizzle/0013) rolls back and answers `closed: true`.
 */
export async function writeEntries<T>(
	work: (insert: InsertEntry, tx: Tx) => Promise<T>
): Promise<{ closed: false; value: T } | { closed: true }> {
	const written: Parameters<typeof announceEntry>[0][] = [];
	let value: T;
	try {
		value = await db.transaction(async (tx) => {
			const insert: InsertEntry = async (values) => {
				const [row] = await tx
					.insert(s.logEntry)
					.values(values)
					.onConflictDoNothing({ target: [s.logEntry.shopId, s.logEntry.id] })
					.returning({ id: s.logEntry.id, seq: s.logEntry.seq });
				if (!row) return null;
				written.push({ ...row, shopId: values.shopId, jobId: values.jobId, kind: values.kind });
				return row;
			};
			return work(insert, tx);
		});
	} catch (err) {
		if (isClosedRecord(err)) return { closed: true };
		throw err;
	}
	for (const entry of written) void announceEntry(entry);
	return { closed: false, value };
}

/** Announces an entry a hot path has stored (committed) with its own statement. */
export function announceStored(
	shopId: string,
	row: { id: string; seq: number; jobId: string; kind: string }
): void {
	void announceEntry({ seq: row.seq, id: row.id, shopId, jobId: row.jobId, kind: row.kind });
}
