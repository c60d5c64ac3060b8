// The job log's hash chain, rebuilt outside the database. The database writes each entry's hash
// in the inserting statement (drizzle/0010, log_entry_canonical); this module rebuilds the same
// canonical JSON from the stored values and checks every link, so a change made behind the
// app's back (an UPDATE or DELETE with the append-only trigger switched off) is found.
import { createHash } from 'node:crypto';

/** Keys of the canonical JSON, version 1, in code point order (the order they are written). */
export const CANONICAL_KEYS_V1 = [
	'author_id',
	'id',
	'inspection_item_id',
	'job_id',
	'job_step_id',
	'kind',
	'note',
	'occurred_at',
	'part_id',
	'part_quantity',
	'pos',
	'prev',
	'raw_text',
	'recorded_at',
	'responds_to',
	'retracts',
	'shop_id',
	'source',
	'spec_unit',
	'spec_value',
	'tool_calibration_overdue',
	'torque_tool_id',
	'unit',
	'v',
	'value',
	'verdict'
] as const;

/** The keys version 2 (drizzle/0012) adds: the fluid grade and its verdict, the torque adapter. */
const ADDED_IN_V2 = [
	'adapter_mm',
	'fluid',
	'fluid_verdict',
	'tool_length_mm',
	'wrench_setting',
	'wrench_setting_unit'
] as const;
export type CanonicalKey = (typeof CANONICAL_KEYS_V1)[number] | (typeof ADDED_IN_V2)[number];

/**
 * Keys of version 2, every entry written since drizzle/0012, in code point order (a plain sort
 * orders these ASCII keys the same way).
 */
export const CANONICAL_KEYS: readonly CanonicalKey[] = [
	...CANONICAL_KEYS_V1,
	...ADDED_IN_V2
].sort();

/** An entry's fields in their text form (null stays null); `v` is the entry's chain version. */
export type ChainFields = Record<CanonicalKey, string | null>;

/**
 * The canonical JSON: the version's keys in order, no spaces, each value null or a JSON string.
 * An entry of version 1 (written before drizzle/0012) is rebuilt with version 1's keys, so old
 * entries keep their hashes. JSON.stringify escapes a string exactly as PostgreSQL's
 * to_json(text) does (", \, and control characters; everything else as it is), so both sides
 * produce the same bytes.
 */
export function canonicalJson(fields: ChainFields): string {
	const v1 = fields.v === '1';
	const keys: readonly CanonicalKey[] = v1 ? CANONICAL_KEYS_V1 : CANONICAL_KEYS;
	const parts = keys.map((key) => {
		const value = fields[key];
		return `${JSON.stringify(key)}:${value === null ? 'null' : JSON.stringify(value)}`;
	});
	return `{${parts.join(',')}}`;
}

/** SHA-256 of the canonical JSON's UTF-8 bytes, as 64 lower-case hex digits. */
export function entryHash(fields: ChainFields): string {
	return createHash('sha256').update(canonicalJson(fields), 'utf8').digest('hex');
}

export interface ChainRow {
	fields: ChainFields;
	/** The hash stored with the entry. */
	hash: string;
}

export type BreakReason = 'changed' | 'missing_before' | 'link' | 'missing_after' | 'no_head';

export interface ChainBreak {
	/** The entry where the chain first fails; null when the job's last entries are gone. */
	entryId: string | null;
	pos: number | null;
	reason: BreakReason;
	message: string;
}

/** The head the database keeps per job: how many entries, and the last hash. */
export interface ChainHead {
	pos: number;
	hash: string | null;
}

/**
 * Walks one job's entries in chain order and answers the first break, or null when every
 * entry's hash matches its content, each links to the one before, and the head matches the last.
 * Feed rows one at a time (`step`) so a long log never has to sit in memory whole.
 */
export class ChainWalker {
	private expectedPos = 1;
	private prev: string | null = null;
	private lastId: string | null = null;
	broken: ChainBreak | null = null;
	count = 0;

	step(row: ChainRow): void {
		if (this.broken) return;
		this.count++;
		const pos = Number(row.fields.pos);
		const id = row.fields.id;
		if (pos !== this.expectedPos) {
			this.broken = {
				entryId: id,
				pos,
				reason: 'missing_before',
				message:
					pos > this.expectedPos
						? `Entries ${this.expectedPos}–${pos - 1} of this job are missing before this entry.`
						: `This entry repeats position ${pos}.`
			};
		} else if (row.fields.prev !== this.prev) {
			this.broken = {
				entryId: id,
				pos,
				reason: 'link',
				message: 'This entry does not point at the hash of the entry before it.'
			};
		} else if (entryHash(row.fields) !== row.hash) {
			this.broken = {
				entryId: id,
				pos,
				reason: 'changed',
				message:
					'This entry’s content no longer matches its hash: it was changed after it was written.'
			};
		}
		this.prev = row.hash;
		this.lastId = id;
		this.expectedPos = pos + 1;
	}

	/** Call after the last row: compares the end of the chain with the job's head. */
	finish(head: ChainHead | null): ChainBreak | null {
		if (this.broken) return this.broken;
		const last = this.expectedPos - 1;
		if (!head) {
			if (last > 0) {
				this.broken = {
					entryId: this.lastId,
					pos: last,
					reason: 'no_head',
					message: 'This job’s chain head is missing.'
				};
			}
			return this.broken;
		}
		if (head.pos !== last || head.hash !== this.prev) {
			this.broken = {
				entryId: null,
				pos: last + 1,
				reason: 'missing_after',
				message:
					head.pos > last
						? `The head records ${head.pos} entries; the log ends at ${last}: the newest are missing.`
						: 'The last entry does not match the job’s recorded head.'
			};
		}
		return this.broken;
	}
}
