// Job states. Pure: shared by the server, the screens and the state machine.

export const jobStates = [
	'open',
	'in_work',
	'final_inspection',
	'ready_to_invoice',
	'invoiced',
	'paid',
	'on_hold',
	'cancelled'
] as const;
export type JobState = (typeof jobStates)[number];

/** States in which a job is on the floor (in a bay or waiting for one). */
export const activeStates: readonly JobState[] = ['open', 'in_work', 'final_inspection', 'on_hold'];

export const stateLabels: Record<JobState, string> = {
	open: 'Open',
	in_work: 'In work',
	final_inspection: 'Final inspection',
	ready_to_invoice: 'Ready to invoice',
	invoiced: 'Invoiced',
	paid: 'Paid',
	on_hold: 'On hold',
	cancelled: 'Cancelled'
};

/**
 * States whose record is closed: the job log and its photos take nothing more (the database
 * holds the same list: drizzle/0013). New work on the vehicle goes on a new job card.
 */
export const closedStates: readonly JobState[] = ['invoiced', 'paid', 'cancelled'];

/** The words for a closed record, for the Bench and the job card (null while it is open). */
export function closedRecordNote(state: JobState): string | null {
	return closedStates.includes(state)
		? `This job is ${stateLabels[state].toLowerCase()}: its record is closed and takes no more entries or photos.`
		: null;
}
