// Group commit: appends that arrive in the same turn of the event loop are written by one
// statement at the end of that turn (setImmediate, no timer), and while that statement is on its
// way the next batch gathers. Under load, PostgreSQL parses, plans and commits once for many
// entries instead of once each, this process sends one message instead of many, and batches do
// not contend with each other for the same pages. Under light load a batch holds one entry and
// waits for nothing. Each append still gets its own answer: its stored row, or null when its
// conditions did not hold (the caller then decides alone). All entries of a batch commit
// together or not at all; if the statement fails for a reason other than the database being
// away, every entry of the batch answers null and is tried again on its own, so one bad entry
// cannot fail the others.

interface Waiting<Row, Out> {
	row: Row;
	resolve: (out: Out | null) => void;
	reject: (err: unknown) => void;
}

export interface GroupCommitOptions {
	/** Rows per statement: a batch is one transaction, so keep it short. */
	limit?: number;
	/** When to flush what has gathered; the end of this turn of the event loop by default. */
	schedule?: (flush: () => void) => void;
	/** An error every row of the batch fails with (the database is away); others answer null. */
	failsAll?: (err: unknown) => boolean;
}

export class GroupCommit<Row extends { id: string }, Out> {
	#waiting: Waiting<Row, Out>[] = [];
	#scheduled = false;
	/** A batch is on its way: the next one gathers meanwhile and goes when it is back. */
	#writing = false;
	readonly #write: (rows: Row[]) => Promise<Map<string, Out>>;
	readonly #limit: number;
	readonly #schedule: (flush: () => void) => void;
	readonly #failsAll: (err: unknown) => boolean;

	/** `write` stores the rows in one statement and answers the stored ones by id. */
	constructor(write: (rows: Row[]) => Promise<Map<string, Out>>, opts: GroupCommitOptions = {}) {
		this.#write = write;
		this.#limit = opts.limit ?? 200;
		this.#schedule = opts.schedule ?? ((flush) => setImmediate(flush));
		this.#failsAll = opts.failsAll ?? (() => false);
	}

	/** The row's stored result, or null when the batch did not store it. */
	add(row: Row): Promise<Out | null> {
		// The same id twice in one batch (a device repeating itself at once): the second goes alone.
		if (this.#waiting.some((w) => w.row.id === row.id)) return Promise.resolve(null);
		return new Promise((resolve, reject) => {
			this.#waiting.push({ row, resolve, reject });
			this.#scheduleFlush();
		});
	}

	#scheduleFlush() {
		if (this.#scheduled || this.#writing || this.#waiting.length === 0) return;
		this.#scheduled = true;
		this.#schedule(() => this.#flush());
	}

	#flush() {
		this.#scheduled = false;
		if (this.#writing) return;
		const batch = this.#waiting.slice(0, this.#limit);
		this.#waiting = this.#waiting.slice(this.#limit);
		this.#writing = true;
		void this.#writeBatch(batch).finally(() => {
			this.#writing = false;
			this.#scheduleFlush();
		});
	}

	async #writeBatch(batch: Waiting<Row, Out>[]) {
		let stored: Map<string, Out>;
		try {
			stored = await this.#write(batch.map((w) => w.row));
		} catch (err) {
			if (this.#failsAll(err)) for (const w of batch) w.reject(err);
			else for (const w of batch) w.resolve(null);
			return;
		}
		for (const w of batch) w.resolve(stored.get(w.row.id) ?? null);
	}
}
