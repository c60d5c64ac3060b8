/**
 * The Bench's outbox in the browser: the IndexedDB queue of entries not yet held by the server,
 * sent again with back-off until they are. Nothing typed or heard is lost while the network is
 * down.
 */
import { browserQueue } from './browser';
import type { EntryQueue, NewEntry, QueuedEntry, SendOutcome } from './queue';

export class BenchOutbox {
	#queue: EntryQueue | null = null;
	#retryTimer: ReturnType<typeof setTimeout> | undefined;
	/** Every entry the queue holds, refused ones included. */
	waiting = $state<readonly QueuedEntry[]>([]);
	/** Entries still to be sent (refused ones wait for the technician instead). */
	readonly pending = $derived(this.waiting.filter((w) => w.refused === undefined));

	/** Opens the signed-in user's queue and sends what it holds; returns the teardown. */
	open(userId: string, onSettled: (entry: QueuedEntry, outcome: SendOutcome) => void) {
		this.#queue = browserQueue(userId, {
			onChange: (w) => (this.waiting = [...w]),
			onSettled
		});
		void this.#queue.init().then(() => this.flush());
		const online = () => this.sendNow();
		window.addEventListener('online', online);
		return () => {
			window.removeEventListener('online', online);
			clearTimeout(this.#retryTimer);
		};
	}

	pendingFor(jobId: string | undefined) {
		return this.pending.filter((w) => w.jobId === jobId);
	}

	async add(entry: NewEntry) {
		await this.#queue?.enqueue(entry);
		void this.flush();
	}

	async flush() {
		if (!this.#queue) return;
		await this.#queue.flush();
		this.#scheduleRetry();
	}

	/** The server is reachable again: send what waits now rather than when its back-off ends. */
	sendNow() {
		this.#queue?.resetBackoff();
		void this.flush();
	}

	/** Sends what waits now, if anything does. */
	sendWaiting() {
		if (this.#queue && this.#queue.waiting.length > 0) this.sendNow();
	}

	sendAgain(id: string) {
		void this.#queue?.sendAgain(id).then(() => this.flush());
	}

	remove(id: string) {
		void this.#queue?.remove(id);
	}

	#scheduleRetry() {
		clearTimeout(this.#retryTimer);
		const at = this.#queue?.nextAttemptAt();
		if (at === null || at === undefined) return;
		this.#retryTimer = setTimeout(() => void this.flush(), Math.max(250, at - Date.now()));
	}
}
