/**
 * Torque tools: the wrench setting for an extension or adapter, the ISO 6789 permissible
 * deviation of a click wrench, and when a torque tool's calibration falls due. Pure functions;
 * they throw a RangeError with a clear message for input that has no answer (a negative
 * lever, an adapter longer than the wrench), so forms should validate first.
 */
import { convert } from '../units/index';

export interface ExtensionOptions {
	/** true when the adapter points back toward the handle and shortens the lever. */
	shortens?: boolean;
}

function positive(name: string, x: number): void {
	if (typeof x !== 'number' || !Number.isFinite(x) || x <= 0) {
		throw new RangeError(`${name} must be a number above zero (got ${String(x)}).`);
	}
}

/**
 * Wrench setting that applies `target` at the fastener through an extension or adapter in line
 * with the wrench: target × L / (L + E), or target × L / (L − E) when the adapter shortens the
 * lever. L is the wrench's effective length (hand position to square drive), E the adapter's
 * length in the same unit; the torque comes out in the target's unit.
 */
export function extensionSetting(
	target: number,
	wrenchLength: number,
	extensionLength: number,
	opts: ExtensionOptions = {}
): number {
	positive('The target torque', target);
	positive('The wrench length', wrenchLength);
	if (
		typeof extensionLength !== 'number' ||
		!Number.isFinite(extensionLength) ||
		extensionLength < 0
	) {
		throw new RangeError(
			`The extension length must be zero or more (got ${String(extensionLength)}).`
		);
	}
	const lever = opts.shortens ? wrenchLength - extensionLength : wrenchLength + extensionLength;
	if (lever <= 0) {
		throw new RangeError('An adapter that shortens the lever must be shorter than the wrench.');
	}
	return (target * wrenchLength) / lever;
}

export interface Deviation {
	/** Permissible deviation in percent of the reading. */
	pct: number;
	/** The band of readings that pass, in the reading's unit. */
	min: number;
	max: number;
}

/**
 * ISO 6789-1 Type II (setting, click) class A wrench: permissible deviation ±4 % of the reading
 * above 10 N·m, ±6 % at or below 10 N·m. The reading may be in any torque unit; the 10 N·m
 * threshold is judged after conversion. This is the tool's accuracy, not a fastener tolerance.
 */
export function iso6789TypeIIClassA(reading: number, unit = 'N.m'): Deviation {
	positive('The reading', reading);
	const nm = convert(reading, unit, 'N.m');
	const pct = nm > 10 ? 4 : 6;
	const d = (reading * pct) / 100;
	return { pct, min: reading - d, max: reading + d };
}

export interface WrenchCheck extends Deviation {
	/** (measured − set) / set in percent. */
	deviationPct: number;
	ok: boolean;
}

/** Checks a calibration reading of a Type II class A click wrench at a set value. */
export function checkClickWrench(set: number, measured: number, unit = 'N.m'): WrenchCheck {
	positive('The measured torque', measured);
	const band = iso6789TypeIIClassA(set, unit);
	const deviationPct = ((measured - set) / set) * 100;
	const slack = 1e-9 * set;
	return {
		...band,
		deviationPct,
		ok: measured >= band.min - slack && measured <= band.max + slack
	};
}

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
