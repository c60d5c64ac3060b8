/**
 * The Bench's open job in the browser: its steps, its log and the foreman's open redos. Seeded
 * from the page's load (writable deriveds: a new load starts again from it), then kept current
 * by the live stream, the outbox's answers and this device's last-seen copy.
 */
import { untrack } from 'svelte';
import { createPhraseParser } from '$lib/phrase';
import type { OpenRedo } from '$lib/floor/log';
import { lastSeen } from './browser';
import { newerView } from './last-seen';
import { procedureProgress, stepsById, toStepSpecs } from './call';
import type { BenchStep, EntryView } from './types';

/** What the Bench's load gives this state. */
export interface BenchJobData {
	me: { id: string };
	job: { id: string } | null;
	steps: BenchStep[];
	entries: EntryView[];
	nextBefore: number | null;
	redos: OpenRedo[];
}

export class BenchJobState {
	#data: () => BenchJobData;
	#seen: ReturnType<typeof lastSeen> | null = null;

	constructor(data: () => BenchJobData) {
		this.#data = data;
	}

	// deriveds are lazy: these first read `data` once the constructor has stored it
	steps = $derived.by(() => this.#data().steps);
	entries = $derived.by(() => this.#data().entries);
	nextBefore = $derived.by(() => this.#data().nextBefore);
	/** The foreman's open redo orders: refreshed with the steps whenever the live log moves. */
	redos = $derived.by(() => this.#data().redos);
	/** Plain objects for the phrase engine: labels indexed once per load, `done` kept current. */
	readonly specs = $derived.by(() => toStepSpecs(this.#data().steps));
	readonly parser = $derived(createPhraseParser(this.specs));
	/** The job's stream is open. */
	live = $state(false);
	/** This device's last-seen copy has been read for the job (only then is it written). */
	restored = $state(false);

	readonly jobId = $derived.by(() => this.#data().job?.id ?? null);
	readonly stepById = $derived(stepsById(this.steps));
	readonly nextStep = $derived(this.steps.find((st) => !st.done) ?? null);
	readonly openSteps = $derived(this.steps.filter((st) => !st.done).length);
	readonly procedures = $derived(procedureProgress(this.steps));

	/** Adds or replaces entries by id; a retraction strikes through the entry it names. */
	merge(list: EntryView[]) {
		const known: Record<string, EntryView> = Object.fromEntries(this.entries.map((e) => [e.id, e]));
		for (const e of list) known[e.id] = e;
		for (const e of list) {
			if (e.kind === 'retraction' && e.retracts) {
				const t = known[e.retracts];
				if (t && !t.retractedBy) {
					known[t.id] = {
						...t,
						retractedBy: { id: e.id, authorName: e.authorName, at: e.recordedAt }
					};
				}
			}
		}
		this.entries = Object.values(known).sort((a, b) => b.seq - a.seq);
	}

	#setSteps(steps: BenchStep[], redos: OpenRedo[]) {
		this.steps = steps;
		this.redos = redos;
		const done: Record<string, boolean> = Object.fromEntries(steps.map((st) => [st.id, st.done]));
		for (const s of this.specs) s.done = done[s.id] ?? s.done;
	}

	async refreshSteps() {
		const jobId = this.jobId;
		if (!jobId) return;
		const res = await fetch(`/api/jobs/${jobId}/steps`);
		if (!res.ok || jobId !== this.jobId) return;
		const body = (await res.json()) as { steps: BenchStep[]; redos: OpenRedo[] };
		this.#setSteps(body.steps, body.redos);
	}

	/** Reads what the log gained since the newest entry shown. */
	async catchUp() {
		const jobId = this.jobId;
		if (!jobId || document.hidden) return;
		const after = this.entries.reduce((m, e) => Math.max(m, e.seq), 0);
		try {
			const res = await fetch(`/api/jobs/${jobId}/entries?after=${after}&limit=200`);
			if (!res.ok) return;
			const body = (await res.json()) as { entries: EntryView[] };
			if (body.entries.length && jobId === this.jobId) {
				this.merge(body.entries);
				await this.refreshSteps();
			}
		} catch {
			// offline: the next tick tries again
		}
	}

	async olderEntries() {
		const jobId = this.jobId;
		if (!jobId || this.nextBefore === null) return;
		const res = await fetch(`/api/jobs/${jobId}/entries?before=${this.nextBefore}&limit=50`);
		if (!res.ok) return;
		const body = (await res.json()) as { entries: EntryView[]; nextBefore: number | null };
		this.merge(body.entries);
		this.nextBefore = body.nextBefore;
	}

	/**
	 * An offline reload gets the page the service worker kept, which may be older than what this
	 * device saw since: the newer view is kept on the device and shown instead.
	 */
	restoreLastSeen(jobId: string | null) {
		untrack(() => {
			this.restored = false;
			if (jobId) void this.#restore(jobId);
		});
	}

	async #restore(jobId: string) {
		this.#seen ??= lastSeen(this.#data().me.id);
		const page = {
			jobId,
			steps: this.steps,
			entries: this.entries,
			redos: this.redos,
			nextBefore: this.nextBefore
		};
		const newer = newerView(page, await this.#seen.load(jobId));
		if (jobId !== this.jobId) return;
		if (newer) {
			this.merge(newer.entries);
			this.#setSteps(newer.steps, newer.redos);
		}
		this.restored = true;
	}

	/** Keeps what this device has seen of the job, once its earlier copy has been read. */
	saveLastSeen() {
		const jobId = this.jobId;
		if (!this.restored || !jobId) return;
		const view = $state.snapshot({
			jobId,
			steps: this.steps,
			entries: this.entries,
			redos: this.redos,
			nextBefore: this.nextBefore
		});
		untrack(() => void this.#seen?.save(view));
	}
}
