/**
 * A torque tool's check against a torque tester, judged by the permissible deviation of
 * ISO 6789-1:2017 for its type and class, at the test points of ISO 6789-2:2017.
 *
 * Sources and marks (ISO 6789-1:2017 and ISO 6789-2:2017):
 * - Type II (setting, "click") class A: ±4 % of reading above 10 N·m, ±6 % at or below
 *   10 N·m [SRC: a tool maker's summary of the standard].
 * - Type II classes D and G share class A's limits; classes B, C, E and F are ±6 % [MEM].
 * - The 10 N·m line is read against the tool's maximum [MEM].
 * - Test points 20 %, 60 % and 100 % of the maximum, five readings at each for a calibration
 *   [MEM: ISO 6789-2:2017]; a tool whose range starts above 20 % is tested at its minimum.
 * Any other kind of tool (an indicating wrench, a class Benchcall does not read) is checked
 * against the permissible deviation the owner states from the tool's certificate.
 * Pure; never throws.
 */
import { canConvert, convert } from '../units';

/** The standard's number of readings at each test point for a calibration [MEM]. */
export const READINGS_PER_POINT = 5;
/** The test points as fractions of the tool's maximum [MEM: ISO 6789-2:2017]. */
export const TEST_FRACTIONS = [0.2, 0.6, 1] as const;

export interface ToolClass {
	type: 'I' | 'II';
	cls: string;
}

const KIND_RE = /\btype\s*(ii|i|2|1)\b[\s,/-]*(?:class\s*)?([a-g])?\b/i;

/** Reads "Type II class A click" (the tool's kind as the shop wrote it); null when it cannot. */
export function toolClass(kind: string | null | undefined): ToolClass | null {
	if (typeof kind !== 'string') return null;
	const m = KIND_RE.exec(kind);
	if (!m || !m[2]) return null;
	const type = m[1]?.toLowerCase() === 'ii' || m[1] === '2' ? 'II' : 'I';
	return { type, cls: m[2].toUpperCase() };
}

/**
 * The permissible deviation in percent for a tool of this kind and maximum (in `unit`), or
 * null when Benchcall does not know it (the owner states it then).
 */
export function permissiblePct(
	kind: string | null | undefined,
	max: number,
	unit: string
): number | null {
	const c = toolClass(kind);
	if (!c || c.type !== 'II') return null;
	if (c.cls === 'B' || c.cls === 'C' || c.cls === 'E' || c.cls === 'F') return 6;
	if (!canConvert(unit, 'N.m') || !Number.isFinite(max)) return null;
	return convert(max, unit, 'N.m') <= 10 ? 6 : 4;
}

/** The torques to set on the tester: 20 %, 60 % and 100 % of the maximum (the minimum if higher). */
export function testPoints(rangeMin: number, rangeMax: number): number[] {
	return TEST_FRACTIONS.map((f) => {
		const p = Math.max(rangeMax * f, rangeMin);
		// the figures an owner types: no float noise such as 24.000000000000004
		return Math.round(p * 1e6) / 1e6;
	});
}

export interface PointReadings {
	/** The torque set on the tool (the test point). */
	set: number;
	/** What the tester showed, one figure a reading. */
	readings: number[];
}

export interface CheckResult {
	passed: boolean;
	/** The largest deviation by size, signed, in percent of the set value. */
	worstPct: number;
	/** Each reading's deviation in percent, point by point. */
	deviations: number[][];
	/** Points with fewer readings than the standard asks for (the check still counts). */
	short: number[];
	problems: string[];
}

/** Deviation of one reading in percent of the set value. */
export function deviationPct(set: number, reading: number): number {
	return ((reading - set) / set) * 100;
}

/**
 * Judges a check: it passes when every reading lies within ±`limitPct` of its set value.
 * Bad input (no points, a set value of zero or less, a reading that is not a number) is a
 * problem and the check does not pass.
 */
export function judgeCheck(points: PointReadings[], limitPct: number): CheckResult {
	const out: CheckResult = { passed: false, worstPct: 0, deviations: [], short: [], problems: [] };
	if (!Number.isFinite(limitPct) || limitPct <= 0 || limitPct > 50) {
		out.problems.push('The permissible deviation must be above 0 % and at most 50 %.');
	}
	if (points.length === 0) out.problems.push('Enter the readings of at least one test point.');
	for (const p of points) {
		if (!Number.isFinite(p.set) || p.set <= 0) {
			out.problems.push('Every test point must be above zero.');
			out.deviations.push([]);
			continue;
		}
		if (p.readings.length === 0 || p.readings.some((r) => !Number.isFinite(r) || r < 0)) {
			out.problems.push(`Enter at least one reading of zero or more at ${p.set}.`);
		}
		if (p.readings.length < READINGS_PER_POINT) out.short.push(p.set);
		const devs = p.readings.filter(Number.isFinite).map((r) => deviationPct(p.set, r));
		out.deviations.push(devs);
		for (const d of devs) if (Math.abs(d) > Math.abs(out.worstPct)) out.worstPct = d;
	}
	// a reading right on the limit passes: compare with a little room for float noise
	out.passed = out.problems.length === 0 && Math.abs(out.worstPct) <= limitPct + 1e-9;
	return out;
}
