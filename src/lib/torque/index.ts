/**
 * Torque tools: when a torque tool's calibration falls due. Pure functions; they throw a
 * RangeError with a clear message for input that has no answer, so forms should validate first.
 */
export interface CalibrationPolicy {
	/** Interval in months (default 12, the tool makers' guidance). */
	months?: number;
	/** Cycle limit (default 5000); the tool is due when either limit is reached. */
	cycleLimit?: number;
	/** Days before the due date from which the tool shows as due soon (default 30). */
	warnDays?: number;
}

export interface CalibrationStatus {
	/** 'YYYY-MM-DD': the last day the calibration is valid for. */
	dueDate: string;
	state: 'ok' | 'due_soon' | 'overdue';
	/** Whole days from today to the due date (negative when overdue). */
	daysLeft: number;
	/** Why: 'date' or 'cycles'; null while ok. */
	reason: 'date' | 'cycles' | null;
}

const DAY_MS = 86_400_000;

function parseDay(d: Date | string, name: string): number {
	if (typeof d === 'string') {
		const m = /^(\d{4})-(\d{2})-(\d{2})/.exec(d);
		if (!m) throw new RangeError(`${name} must be a date like 2026-12-02 (got '${d}').`);
		const t = Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]));
		if (Number.isNaN(t)) throw new RangeError(`${name} is not a valid date ('${d}').`);
		return t;
	}
	if (!(d instanceof Date) || Number.isNaN(d.getTime())) {
		throw new RangeError(`${name} is not a valid date.`);
	}
	return Date.UTC(d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate());
}

/** Adds calendar months, keeping to the month's last day (31 Jan + 1 month = 28/29 Feb). */
export function addMonths(day: string, months: number): string {
	const t = new Date(parseDay(day, 'The date'));
	const y = t.getUTCFullYear();
	const m = t.getUTCMonth() + Math.trunc(months);
	const lastDay = new Date(Date.UTC(y, m + 1, 0)).getUTCDate();
	const d = Math.min(t.getUTCDate(), lastDay);
	return new Date(Date.UTC(y, m, d)).toISOString().slice(0, 10);
}

/**
 * When a torque tool's calibration falls due: `months` after the last calibration (default
 * 12), or at `cycleLimit` uses (default 5000), whichever first. Dates are calendar days
 * ('YYYY-MM-DD' or a Date read in UTC); `today` defaults to now.
 */
export function calibrationDue(
	lastCalibrated: Date | string,
	opts: CalibrationPolicy & { cyclesUsed?: number; today?: Date | string } = {}
): CalibrationStatus {
	const months = opts.months ?? 12;
	if (!Number.isInteger(months) || months < 1 || months > 120) {
		throw new RangeError(`The calibration interval must be 1 to 120 whole months (got ${months}).`);
	}
	const start = new Date(parseDay(lastCalibrated, 'The calibration date'))
		.toISOString()
		.slice(0, 10);
	const dueDate = addMonths(start, months);
	const today = parseDay(opts.today ?? new Date(), 'Today');
	const daysLeft = Math.round((parseDay(dueDate, 'The due date') - today) / DAY_MS);
	const cycleLimit = opts.cycleLimit ?? 5000;
	const warnDays = opts.warnDays ?? 30;

	if (opts.cyclesUsed !== undefined && opts.cyclesUsed >= cycleLimit) {
		return { dueDate, state: 'overdue', daysLeft, reason: 'cycles' };
	}
	if (daysLeft < 0) return { dueDate, state: 'overdue', daysLeft, reason: 'date' };
	if (daysLeft <= warnDays) return { dueDate, state: 'due_soon', daysLeft, reason: 'date' };
	return { dueDate, state: 'ok', daysLeft, reason: null };
}
