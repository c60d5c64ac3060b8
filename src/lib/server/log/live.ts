// A live entry is one that no retraction names: the one definition every reader of the job log
// uses (the Bench's undo, the Floor, job cards, tool checks, vehicle history). The triggers
// that keep the open-work state and drift's readings (drizzle/0011, 0017) apply the same rule
// inside PostgreSQL; `agreement.db.test.ts` checks that the two agree. No database client
// here, so the *-sql.ts modules that benchmarks import stay free of the app's environment.
import { sql, type SQL } from 'drizzle-orm';

function alias(name: string): string {
	if (!/^[a-z_][a-z0-9_]*$/.test(name)) throw new Error(`Not an SQL alias: ${name}`);
	return name;
}

/** SQL text: true while the log entry aliased `entry` has no retraction (of its shop). */
export function liveCondition(entry: string): string {
	const e = alias(entry);
	return `not exists (select 1 from log_entry rx where rx.retracts = ${e}.id and rx.shop_id = ${e}.shop_id)`;
}

/** For drizzle's `sql`: the entry aliased `entry` is live. */
export function isLive(entry: string): SQL {
	return sql.raw(liveCondition(entry));
}

/** For drizzle's `sql`: the entry aliased `entry` is retracted. */
export function isRetracted(entry: string): SQL {
	return sql.raw(`not ${liveCondition(entry)}`);
}
