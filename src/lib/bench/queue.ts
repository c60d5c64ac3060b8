/**
 * The Bench's outbox: every entry is written to device storage before it is sent, and stays
 * there until the server has acknowledged its id. Pure: storage, sending and the clock are
 * injected (IndexedDB and fetch in the browser, plain objects in tests).
 */

export interface QueuedEntry {
	/** Made on the device; the server ignores a repeat of an id it already holds. */
	id: string;
	jobId: string;
	/** The job card's number, to name the job when the entry is shown away from its job. */
	jobNumber?: number;
	text: string;
	source: 'typed' | 'voice';
	/** When it was called out, kept while the entry waits (ISO 8601). */
	occurredAt: string;
	torqueToolId?: string | null;
	/** An adapter picked on the Bench: signed mm along the lever (0: crowfoot at 90°). */
	adapterMm?: number | null;
	stepId?: string;
	retracts?: string;
	/** Who typed it: the server refuses it under any other account (a shared tablet). */
	authorId?: string;
	attempts: number;
	/** Epoch ms before which no new attempt is made. */
	notBefore: number;
	lastError?: string;
	/** The HTTP status of the last failed attempt (401: signed out), 0 for no connection. */
	lastStatus?: number;
	/**
	 * Why the server refused it for good (a job since given to someone else, say). A refused
	 * entry stays on the device, shown with this reason, until it is sent again or removed by hand.
	 */
	refused?: string;
}

export type NewEntry = Omit<
	QueuedEntry,
	'attempts' | 'notBefore' | 'lastError' | 'lastStatus' | 'refused'
>;

export interface QueueStorage {
	load(): Promise<QueuedEntry[] | undefined>;
	save(entries: QueuedEntry[]): Promise<void>;
}

/** What one attempt came to. */
export type SendOutcome =
	| { kind: 'ack'; body?: unknown }
	/** The server read it and refused it for good (a 4xx other than 401, 408, 429). */
	| { kind: 'rejected'; message: string }
	/** Network down, server error, signed out: try again later. */
	| { kind: 'retry'; message: string; status?: number };

export interface QueueOptions {
	storage: QueueStorage;
	send: (entry: QueuedEntry) => Promise<SendOutcome>;
	now?: () => number;
	/** Called after every change with the entries still waiting. */
	onChange?: (waiting: readonly QueuedEntry[]) => void;
	/** Called when an entry leaves the queue. */
	onSettled?: (entry: QueuedEntry, outcome: SendOutcome) => void;
}

export const BACKOFF_BASE_MS = 1000;
export const BACKOFF_MAX_MS = 30_000;

/** Wait before attempt n+1 after n failures: 1 s, 2 s, 4 s … capped at 30 s. */
export function backoffMs(failures: number): number {
	if (!Number.isFinite(failures) || failures < 1) return 0;
	return Math.min(BACKOFF_MAX_MS, BACKOFF_BASE_MS * 2 ** Math.min(failures - 1, 30));
}

/** How an HTTP status is treated: 2xx acknowledged; 401/408/429/5xx retried; other 4xx refused. */
export function outcomeOfStatus(status: number, message: string, body?: unknown): SendOutcome {
	if (status >= 200 && status < 300) return { kind: 'ack', body };
	if (status === 401 || status === 408 || status === 429 || status >= 500 || status === 0) {
		return { kind: 'retry', message, status };
	}
	return { kind: 'rejected', message };
}

function isQueued(x: unknown): x is QueuedEntry {
	if (typeof x !== 'object' || x === null) return false;
	const e = x as Record<string, unknown>;
	return (
		typeof e.id === 'string' &&
		typeof e.jobId === 'string' &&
		typeof e.text === 'string' &&
		typeof e.occurredAt === 'string'
	);
}

export class EntryQueue {
	private entries: QueuedEntry[] = [];
	private loaded = false;
	private flushing: Promise<void> | null = null;
	private readonly now: () => number;

	constructor(private readonly opts: QueueOptions) {
		this.now = opts.now ?? (() => Date.now());
	}

	/** Reads what a previous page left waiting. */
	async init(): Promise<void> {
		if (this.loaded) return;
		const stored = await this.opts.storage.load();
		const known = new Set(this.entries.map((e) => e.id));
		const restored = (Array.isArray(stored) ? stored : []).filter(
			(e) => isQueued(e) && !known.has(e.id)
		);
		this.entries = [...restored, ...this.entries].map((e) => ({
			...e,
			attempts: Number.isFinite(e.attempts) ? e.attempts : 0,
			notBefore: Number.isFinite(e.notBefore) ? e.notBefore : 0
		}));
		this.loaded = true;
		this.changed();
	}

	/** Everything on the device: entries still to send and entries the server refused. */
	get waiting(): readonly QueuedEntry[] {
		return this.entries;
	}

	private get pending(): QueuedEntry[] {
		return this.entries.filter((e) => e.refused === undefined);
	}

	/** Stores the entry first; only then is it sent. A repeat of a waiting id is ignored. */
	async enqueue(entry: NewEntry): Promise<void> {
		// never overwrite what an earlier page stored before it is read
		if (!this.loaded) await this.init();
		if (this.entries.some((e) => e.id === entry.id)) return;
		this.entries = [...this.entries, { ...entry, attempts: 0, notBefore: 0 }];
		await this.persist();
		this.changed();
	}

	/** Epoch ms of the next attempt due, or null when nothing waits. */
	nextAttemptAt(): number | null {
		return this.pending[0]?.notBefore ?? null;
	}

	/** Forget back-off: try everything now (the network came back). */
	resetBackoff(): void {
		this.entries = this.entries.map((e) => ({ ...e, notBefore: 0 }));
	}

	/** A refused entry goes back in line, with its own id and time (the job was given back). */
	async sendAgain(id: string): Promise<void> {
		this.entries = this.entries.map((e) =>
			e.id === id && e.refused !== undefined
				? { ...e, refused: undefined, attempts: 0, notBefore: 0, lastError: undefined }
				: e
		);
		await this.persist();
		this.changed();
	}

	/** Removes a refused entry from the device: only by hand, and only one the server refused. */
	async remove(id: string): Promise<void> {
		this.entries = this.entries.filter((e) => e.id !== id || e.refused === undefined);
		await this.persist();
		this.changed();
	}

	/**
	 * Sends waiting entries in the order they were made (an undo must follow what it undoes).
	 * Stops at the first entry that must wait; concurrent calls share one run.
	 */
	flush(): Promise<void> {
		if (!this.flushing) {
			this.flushing = this.run().finally(() => {
				this.flushing = null;
			});
		}
		return this.flushing;
	}

	private async run(): Promise<void> {
		for (;;) {
			const head = this.pending[0];
			if (!head || head.notBefore > this.now()) return;
			let outcome: SendOutcome;
			try {
				outcome = await this.opts.send(head);
			} catch (e) {
				outcome = { kind: 'retry', message: e instanceof Error ? e.message : 'Not sent.' };
			}
			if (outcome.kind === 'retry') {
				const attempts = head.attempts + 1;
				const retried: QueuedEntry = {
					...head,
					attempts,
					notBefore: this.now() + backoffMs(attempts),
					lastError: outcome.message,
					lastStatus: outcome.status
				};
				this.entries = this.entries.map((e) => (e.id === head.id ? retried : e));
				await this.persist();
				this.changed();
				return;
			}
			this.entries =
				outcome.kind === 'rejected'
					? this.entries.map((e) =>
							e.id === head.id ? { ...e, refused: outcome.message, lastError: undefined } : e
						)
					: this.entries.filter((e) => e.id !== head.id);
			await this.persist();
			this.changed();
			this.opts.onSettled?.(head, outcome);
		}
	}

	private async persist(): Promise<void> {
		await this.opts.storage.save(this.entries);
	}

	private changed(): void {
		this.opts.onChange?.(this.entries);
	}
}
