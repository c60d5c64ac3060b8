// When a procedure with a service interval is due again for a vehicle: after its interval in
// distance from the odometer at the last time it was done, or its interval in months from that
// date, whichever comes first (the usual way a maker states a service schedule: common practice).

export interface IntervalProcedure {
	procedureId: string;
	name: string;
	intervalKm: number | null;
	intervalMonths: number | null;
}

/** The last job of this vehicle that carried the procedure. */
export interface LastDone {
	procedureId: string;
	jobNumber: number;
	on: Date;
	odometer: number | null;
}

/** One odometer reading of the vehicle (from any job card). */
export interface Reading {
	on: Date;
	odometer: number;
}

export type DueState = 'overdue' | 'due_soon' | 'later' | 'unknown';

export interface DueItem {
	procedureId: string;
	name: string;
	lastJobNumber: number | null;
	lastOn: Date | null;
	dueAtOdometer: number | null;
	dueOn: Date | null;
	/** When the distance is expected to be reached, from the vehicle's own use so far. */
	expectedOn: Date | null;
	/** The earlier of dueOn and expectedOn. */
	nextOn: Date | null;
	state: DueState;
}

const DAY = 86_400_000;

/** Calendar months later, kept on the last day of a shorter month (31 Jan + 1 → 28/29 Feb). */
export function addMonths(d: Date, months: number): Date {
	const y = d.getUTCFullYear();
	const m = d.getUTCMonth() + months;
	const last = new Date(Date.UTC(y, m + 1, 0)).getUTCDate();
	return new Date(
		Date.UTC(y, m, Math.min(d.getUTCDate(), last), d.getUTCHours(), d.getUTCMinutes())
	);
}

/** Average distance a day over the readings (first to last); null with under 7 days of data. */
export function dailyUse(readings: Reading[]): number | null {
	if (readings.length < 2) return null;
	const sorted = [...readings].sort((a, b) => a.on.getTime() - b.on.getTime());
	const first = sorted[0];
	const last = sorted[sorted.length - 1];
	const days = (last.on.getTime() - first.on.getTime()) / DAY;
	if (days < 7 || last.odometer < first.odometer) return null;
	return (last.odometer - first.odometer) / days;
}

/**
 * What is due, soonest first. A procedure never done on this vehicle is "unknown" (the shop
 * does not know when it was last done), never silently "later".
 */
export function serviceDue(
	procedures: IntervalProcedure[],
	last: LastDone[],
	readings: Reading[],
	today: Date,
	soonDays = 30
): DueItem[] {
	const rate = dailyUse(readings);
	const latest = [...readings].sort((a, b) => b.on.getTime() - a.on.getTime())[0] ?? null;
	const items = procedures
		.filter((p) => p.intervalKm !== null || p.intervalMonths !== null)
		.map((p): DueItem => {
			const done = last.find((l) => l.procedureId === p.procedureId) ?? null;
			if (!done) {
				return {
					procedureId: p.procedureId,
					name: p.name,
					lastJobNumber: null,
					lastOn: null,
					dueAtOdometer: null,
					dueOn: null,
					expectedOn: null,
					nextOn: null,
					state: 'unknown'
				};
			}
			const dueOn = p.intervalMonths !== null ? addMonths(done.on, p.intervalMonths) : null;
			const dueAtOdometer =
				p.intervalKm !== null && done.odometer !== null ? done.odometer + p.intervalKm : null;
			let expectedOn: Date | null = null;
			let pastDistance = false;
			if (dueAtOdometer !== null && latest) {
				if (latest.odometer >= dueAtOdometer) pastDistance = true;
				else if (rate !== null && rate > 0) {
					expectedOn = new Date(
						latest.on.getTime() + ((dueAtOdometer - latest.odometer) / rate) * DAY
					);
				}
			}
			const dates = [dueOn, expectedOn].filter((d): d is Date => d !== null);
			const nextOn = dates.length ? new Date(Math.min(...dates.map((d) => d.getTime()))) : null;
			let state: DueState = 'later';
			if (pastDistance || (nextOn && nextOn.getTime() <= today.getTime())) state = 'overdue';
			else if (nextOn && nextOn.getTime() <= today.getTime() + soonDays * DAY) state = 'due_soon';
			else if (!nextOn) state = 'unknown';
			return {
				procedureId: p.procedureId,
				name: p.name,
				lastJobNumber: done.jobNumber,
				lastOn: done.on,
				dueAtOdometer,
				dueOn,
				expectedOn,
				nextOn,
				state
			};
		});
	const rank: Record<DueState, number> = { overdue: 0, due_soon: 1, later: 2, unknown: 3 };
	return items.sort(
		(a, b) =>
			rank[a.state] - rank[b.state] ||
			(a.nextOn?.getTime() ?? Infinity) - (b.nextOn?.getTime() ?? Infinity)
	);
}
