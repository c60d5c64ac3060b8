// Statistics for spec drift: mean, sample standard deviation, process capability (Cp, Cpk)
// and a sign test for a torque tool reading to one side of nominal. Pure.
//
// Cp = (USL − LSL) / 6s; Cpu = (USL − mean) / 3s; Cpl = (mean − LSL) / 3s; Cpk = min(Cpu, Cpl)
// (NIST/SEMATECH e-Handbook of Statistical Methods, §6.1.6). The indices mean something only
// over many repeated readings, so they are given from MIN_CAPABILITY_N readings on.

export const MIN_CAPABILITY_N = 20;

export function mean(values: readonly number[]): number {
	if (values.length === 0) return NaN;
	// Kahan summation: many readings of similar size lose little, but it costs nothing.
	let sum = 0;
	let c = 0;
	for (const v of values) {
		const y = v - c;
		const t = sum + y;
		c = t - sum - y;
		sum = t;
	}
	return sum / values.length;
}

/** Sample standard deviation (n − 1 in the denominator); NaN below two values. */
export function sampleStdDev(values: readonly number[]): number {
	if (values.length < 2) return NaN;
	const m = mean(values);
	let ss = 0;
	for (const v of values) ss += (v - m) ** 2;
	return Math.sqrt(ss / (values.length - 1));
}

export interface SpecBand {
	/** Lower spec limit, or null for a one-sided upper spec. */
	lsl: number | null;
	/** Upper spec limit, or null for a one-sided lower spec. */
	usl: number | null;
}

export interface Capability {
	n: number;
	mean: number | null;
	s: number | null;
	cp: number | null;
	cpk: number | null;
	cpu: number | null;
	cpl: number | null;
	/** Why Cp/Cpk are not given (too few readings, no band, no spread); null when they are. */
	reason: string | null;
}

/** Indices from the mean and standard deviation (the e-Handbook's form). */
export function capabilityFrom(m: number, s: number, band: SpecBand) {
	const cpu = band.usl !== null ? (band.usl - m) / (3 * s) : null;
	const cpl = band.lsl !== null ? (m - band.lsl) / (3 * s) : null;
	const cp = band.usl !== null && band.lsl !== null ? (band.usl - band.lsl) / (6 * s) : null;
	const sides = [cpu, cpl].filter((x): x is number => x !== null);
	const cpk = sides.length > 0 ? Math.min(...sides) : null;
	return { cp, cpk, cpu, cpl };
}

/** n, mean, s and, from MIN_CAPABILITY_N readings with a band and some spread, Cp and Cpk. */
export function capability(values: readonly number[], band: SpecBand): Capability {
	const n = values.length;
	return capabilityOf(n, n > 0 ? mean(values) : null, n > 1 ? sampleStdDev(values) : null, band);
}

/** The same from n, mean and sample standard deviation already computed (in SQL, for drift). */
export function capabilityOf(
	n: number,
	m: number | null,
	s: number | null,
	band: SpecBand
): Capability {
	const none = { cp: null, cpk: null, cpu: null, cpl: null };
	if (band.lsl === null && band.usl === null) {
		return { n, mean: m, s, ...none, reason: 'The step has no spec band to compare against.' };
	}
	if (n < MIN_CAPABILITY_N) {
		return {
			n,
			mean: m,
			s,
			...none,
			reason: `Cp and Cpk need at least ${MIN_CAPABILITY_N} readings; there ${n === 1 ? 'is' : 'are'} ${n}.`
		};
	}
	if (!s || s === 0) {
		return { n, mean: m, s, ...none, reason: 'All readings are the same: there is no spread.' };
	}
	return { n, mean: m, s, ...capabilityFrom(m!, s, band), reason: null };
}

/**
 * Two-sided exact sign test: the chance of a split at least this uneven between readings
 * above and below nominal if each side were equally likely. Readings exactly on nominal are
 * left out (common practice for the sign test).
 */
export function signTest(above: number, below: number): number {
	const n = above + below;
	if (n === 0) return 1;
	const k = Math.min(above, below);
	// Terms C(n, i) / 2^n in log form, each from the one before: linear in k, so a window of
	// tens of thousands of readings costs a moment.
	let logTerm = -n * Math.LN2;
	let tail = 0;
	for (let i = 0; i <= k; i++) {
		tail += Math.exp(logTerm);
		logTerm += Math.log(n - i) - Math.log(i + 1);
	}
	return Math.min(1, 2 * tail);
}

export interface SideBias {
	n: number;
	above: number;
	below: number;
	/** Mean deviation from nominal, in percent of nominal. */
	meanDeviationPct: number | null;
	p: number;
	/** 'above' or 'below' when the readings sit to one side beyond chance (p < alpha). */
	side: 'above' | 'below' | null;
}

/**
 * Whether readings sit consistently to one side of their nominal values: deviations in
 * percent of each reading's nominal, judged with the sign test at `alpha` (default 0.01) and
 * from at least `minN` readings (default 8).
 */
export function sideBias(
	readings: readonly { value: number; nominal: number }[],
	opts: { alpha?: number; minN?: number } = {}
): SideBias {
	const usable = readings.filter((r) => Number.isFinite(r.value) && r.nominal > 0);
	const deviations = usable.map((r) => ((r.value - r.nominal) / r.nominal) * 100);
	return sideBiasOf(
		{
			n: usable.length,
			above: deviations.filter((d) => d > 0).length,
			below: deviations.filter((d) => d < 0).length,
			meanDeviationPct: deviations.length > 0 ? mean(deviations) : null
		},
		opts
	);
}

/** The same from counts already made (in SQL, for drift). */
export function sideBiasOf(
	counts: { n: number; above: number; below: number; meanDeviationPct: number | null },
	opts: { alpha?: number; minN?: number } = {}
): SideBias {
	const alpha = opts.alpha ?? 0.01;
	const minN = opts.minN ?? 8;
	const p = signTest(counts.above, counts.below);
	const side =
		counts.n >= minN && p < alpha ? (counts.above > counts.below ? 'above' : 'below') : null;
	return { ...counts, p, side };
}
