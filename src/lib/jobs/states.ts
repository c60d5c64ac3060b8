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
