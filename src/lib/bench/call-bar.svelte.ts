/**
 * The call bar's state: the phrase, its readings, the one picked, the confirm window of a heard
 * phrase, and what the Bench answers. Enter (or the end of the confirm window) logs the picked
 * reading through the outbox; "next", "spec" and "history" answer without logging.
 */
import { goto } from '$app/navigation';
import { closedRecordNote, type JobState } from '$lib/jobs/states';
import { isCancel } from '$lib/phrase';
import { signedLength, type Adapter } from '$lib/torque/adapter';
import { newId, nowIso } from './browser';
import { blocker, JOB_RE, previewRows, spokenResult, type PreviewRow } from './call';
import type { BenchJobState } from './job-state.svelte';
import type { BenchOutbox } from './outbox.svelte';
import type { BenchStep, StepHistoryView } from './types';

/** Seconds a heard phrase waits before it is logged (say or type "cancel", or press Esc). */
export const CONFIRM_SECONDS = 3;

export interface CallBarContext {
	job: BenchJobState;
	outbox: BenchOutbox;
	data: () => {
		job: { id: string; number: number; state: JobState } | null;
		me: { id: string };
		tolerancePct: number;
	};
	/** The shop's zone: "… at 10:30" is the shop's clock time, as the server reads it. */
	timeZone: () => string;
	/** The torque tool and adapter in use, stored with a measurement. */
	tool: () => { id: string; adapter: Adapter | null };
	speak: (text: string) => void;
}

type Message = { tone: 'info' | 'error'; text: string };

export class CallBar {
	#ctx: CallBarContext;
	#text = $state('');
	#picked = $state('');
	#countdownTimer: ReturnType<typeof setInterval> | undefined;
	/** Where the phrase in the bar came from: typed, or heard and put there by voice. */
	source: 'typed' | 'voice' = 'typed';
	inputEl = $state<HTMLInputElement | undefined>();
	message = $state<Message | null>(null);
	answer = $state<{ title: string; step: BenchStep | null } | null>(null);
	history = $state<StepHistoryView | null>(null);
	readback = $state('');
	/** Seconds left in the confirm window of a heard phrase; 0 when none is pending. */
	countdown = $state(0);

	constructor(ctx: CallBarContext) {
		this.#ctx = ctx;
	}

	get text() {
		return this.#text;
	}
	set text(value: string) {
		this.#text = value;
		// a new phrase starts from its best reading again
		if (!value.trim()) this.#picked = '';
	}

	readonly parsed = $derived.by(() =>
		this.#text.trim()
			? this.#ctx.job.parser.parse(this.#text, {
					tolerancePct: this.#ctx.data().tolerancePct,
					timeZone: this.#ctx.timeZone()
				})
			: null
	);
	readonly rows = $derived.by(() =>
		previewRows(
			this.#text,
			this.parsed,
			this.#ctx.job.stepById,
			this.#ctx.job.specs,
			this.#ctx.data().tolerancePct
		)
	);
	/** The reading picked with the arrow keys while it is still offered, else the best one. */
	readonly selected = $derived(
		this.rows.some((r) => r.key === this.#picked) ? this.#picked : (this.rows[0]?.key ?? '')
	);
	readonly selectedRow = $derived(
		this.rows.find((r) => r.key === this.selected) ?? this.rows[0] ?? null
	);

	pick(key: string) {
		this.#picked = key;
	}

	focus() {
		this.inputEl?.focus();
	}

	clear() {
		this.text = '';
		this.source = 'typed';
		this.cancelPending();
	}

	/** Esc: drops the phrase, a pending heard one and any answer shown. */
	dismiss() {
		if (this.countdown) this.message = { tone: 'info', text: 'Cancelled: nothing logged.' };
		this.clear();
		this.answer = null;
		this.history = null;
	}

	cancelPending() {
		clearInterval(this.#countdownTimer);
		this.#countdownTimer = undefined;
		this.countdown = 0;
	}

	/** A heard phrase: shown in the bar and logged when the confirm window runs out. */
	confirm(words: string) {
		this.cancelPending();
		this.text = words;
		this.source = 'voice';
		this.countdown = CONFIRM_SECONDS;
		this.#countdownTimer = setInterval(() => {
			this.countdown -= 1;
			if (this.countdown <= 0) this.logNow();
		}, 1000);
	}

	/** Logs the pending heard phrase now (Enter during the confirm window). */
	logNow() {
		this.cancelPending();
		void this.commit(this.selectedRow, 'voice');
	}

	/** A heard phrase the technician checks and sends by hand. */
	check(words: string, note: string) {
		this.cancelPending();
		this.text = words;
		this.source = 'voice';
		this.message = { tone: 'info', text: note };
		this.focus();
	}

	cancelled() {
		this.clear();
		this.message = { tone: 'info', text: 'Cancelled: nothing logged.' };
	}

	async commit(row: PreviewRow | null, from: 'typed' | 'voice' = this.source) {
		this.message = null;
		const raw = this.text;
		const wanted = JOB_RE.exec(raw);
		if (wanted) {
			this.clear();
			await goto(`/bench?job=${wanted[1]}`, { keepFocus: true });
			return;
		}
		if (isCancel(raw)) return this.cancelled();
		const { job: open, me } = this.#ctx.data();
		if (!row || !open) return;
		const why = blocker(row);
		if (why) {
			this.message = { tone: 'error', text: why };
			return;
		}
		const p = row.parsed;
		this.history = null;
		if (p.intent === 'history' && row.step) {
			this.clear();
			return this.#showHistory(open.id, row.step.id);
		}
		if (p.intent === 'next') {
			const next = this.#ctx.job.nextStep;
			this.answer = { title: next ? 'Next step' : 'Every step is done', step: next };
			this.clear();
			return;
		}
		if (p.intent === 'spec') {
			this.answer = { title: 'Spec', step: row.step };
			this.clear();
			return;
		}
		// a closed record takes no entries (the server answers 409): say so rather than queue one
		const closed = closedRecordNote(open.state);
		if (closed) {
			this.message = { tone: 'error', text: closed };
			return;
		}
		const tool = this.#ctx.tool();
		const entry = {
			id: newId(),
			jobId: open.id,
			jobNumber: open.number,
			authorId: me.id,
			text: raw.trim(),
			source: from,
			occurredAt: nowIso(),
			torqueToolId: tool.id || null,
			adapterMm: tool.adapter ? signedLength(tool.adapter) : null,
			stepId: row.picked && row.step ? row.step.id : undefined
		};
		this.readback = spokenResult(row);
		if (from === 'voice' && this.readback) this.#ctx.speak(this.readback);
		this.answer = null;
		this.clear();
		await this.#ctx.outbox.add(entry);
	}

	async #showHistory(jobId: string, stepId: string) {
		const res = await fetch(`/api/jobs/${jobId}/history?step=${stepId}`).catch(() => null);
		if (!res) {
			this.message = { tone: 'error', text: 'No connection: past readings come from the server.' };
			return;
		}
		const body = await res.json().catch(() => ({}));
		if (res.ok) {
			this.answer = null;
			this.history = body as StepHistoryView;
		} else {
			this.message = { tone: 'error', text: body.message ?? `The server answered ${res.status}.` };
		}
	}
}
