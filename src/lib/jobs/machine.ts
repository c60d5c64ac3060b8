// The job state machine. Pure: the server calls it inside the transaction that records the
// change; screens call it to offer only the actions that would be accepted.
import { stateLabels, type JobState } from './states';

/**
 * Facts the guards need, gathered by the caller (the server reads them from the job, its
 * steps and its log; the Floor supplies sign-off and open out-of-spec entries).
 */
export interface TransitionFacts {
	/** Steps on the job and steps with at least one live entry. */
	stepsTotal: number;
	stepsDone: number;
	/** The foreman has signed the job off. */
	signedOff: boolean;
	/** Out-of-spec entries not yet answered (accepted with a reason, or redone in spec). */
	openOutOfSpec: number;
	/** For a job on hold: the state it left, where it resumes. */
	heldFrom: JobState | null;
}

export const noFacts: TransitionFacts = {
	stepsTotal: 0,
	stepsDone: 0,
	signedOff: false,
	openOutOfSpec: 0,
	heldFrom: null
};

export type TransitionCheck = { ok: true } | { ok: false; message: string };

/** The forward path of a job card. */
export const mainPath: readonly JobState[] = [
	'open',
	'in_work',
	'final_inspection',
	'ready_to_invoice',
	'invoiced',
	'paid'
];

/** States from which a job may be put on hold or cancelled. */
const holdable: readonly JobState[] = ['open', 'in_work', 'final_inspection', 'ready_to_invoice'];

/** Moves besides hold, resume and cancel. A move back needs a reason. */
const moves: Partial<Record<JobState, readonly JobState[]>> = {
	open: ['in_work'],
	in_work: ['final_inspection'],
	// Back to work when the foreman orders a redo during final inspection.
	final_inspection: ['ready_to_invoice', 'in_work'],
	// Extra work found before invoicing.
	ready_to_invoice: ['invoiced', 'in_work'],
	// A credit note reopens invoicing.
	invoiced: ['paid', 'ready_to_invoice']
};

function isBackward(from: JobState, to: JobState): boolean {
	const a = mainPath.indexOf(from);
	const b = mainPath.indexOf(to);
	return a >= 0 && b >= 0 && b < a;
}

function hasReason(reason: string | null | undefined): boolean {
	return typeof reason === 'string' && reason.trim().length > 0;
}

const refuse = (message: string): TransitionCheck => ({ ok: false, message });

/** Whether `from → to` is allowed with these facts and this reason; a message when it is not. */
export function checkTransition(
	from: JobState,
	to: JobState,
	facts: Partial<TransitionFacts> = {},
	reason?: string | null
): TransitionCheck {
	const f = { ...noFacts, ...facts };
	const fromLabel = stateLabels[from];
	const toLabel = stateLabels[to];
	if (from === to) return refuse(`The job is already ${fromLabel.toLowerCase()}.`);
	if (from === 'paid') return refuse('The job is paid: its record is closed.');
	if (from === 'cancelled') return refuse('The job is cancelled: its record is closed.');

	if (to === 'cancelled') {
		if (from === 'invoiced') {
			return refuse('An invoiced job cannot be cancelled: issue a credit note first.');
		}
		if (!hasReason(reason)) return refuse('Say why the job is cancelled.');
		return { ok: true };
	}
	if (to === 'on_hold') {
		if (!holdable.includes(from)) {
			return refuse(`A job that is ${fromLabel.toLowerCase()} cannot be put on hold.`);
		}
		if (!hasReason(reason)) return refuse('Say why the job is on hold.');
		return { ok: true };
	}
	if (from === 'on_hold') {
		if (!f.heldFrom) return refuse('It is not known which state the job left; pick it again.');
		if (to !== f.heldFrom) {
			return refuse(
				`A job on hold resumes where it left off (${stateLabels[f.heldFrom].toLowerCase()}), not ${toLabel.toLowerCase()}.`
			);
		}
		return { ok: true };
	}

	if (!(moves[from] ?? []).includes(to)) {
		return refuse(`A job cannot go from ${fromLabel.toLowerCase()} to ${toLabel.toLowerCase()}.`);
	}
	if (isBackward(from, to) && !hasReason(reason)) {
		return refuse(`Say why the job goes back to ${toLabel.toLowerCase()}.`);
	}
	if (from === 'in_work' && to === 'final_inspection') {
		if (f.stepsTotal > f.stepsDone && !hasReason(reason)) {
			const open = f.stepsTotal - f.stepsDone;
			return refuse(
				`${open} step${open === 1 ? ' is' : 's are'} not done: finish ${open === 1 ? 'it' : 'them'} or say why the job goes to final inspection anyway.`
			);
		}
	}
	if (to === 'ready_to_invoice' && from === 'final_inspection') {
		if (!f.signedOff) return refuse('The job needs the foreman’s sign-off first.');
		if (f.openOutOfSpec > 0) {
			return refuse(
				`${f.openOutOfSpec} out-of-spec entr${f.openOutOfSpec === 1 ? 'y is' : 'ies are'} not answered: accept with a reason or redo first.`
			);
		}
	}
	return { ok: true };
}

/** Every state reachable from `from` with these facts, if a reason is given where one is needed. */
export function nextStates(from: JobState, facts: Partial<TransitionFacts> = {}): JobState[] {
	const all: JobState[] = [...mainPath, 'on_hold', 'cancelled'];
	return all.filter((to) => checkTransition(from, to, facts, 'reason given').ok);
}

/** Whether moving to `to` from `from` needs a written reason. */
export function needsReason(
	from: JobState,
	to: JobState,
	facts: Partial<TransitionFacts> = {}
): boolean {
	return (
		checkTransition(from, to, facts, 'reason given').ok && !checkTransition(from, to, facts).ok
	);
}
