import * as ss from 'simple-statistics';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	capability,
	capabilityFrom,
	capabilityOf,
	mean,
	MIN_CAPABILITY_N,
	sampleStdDev,
	sideBias,
	sideBiasOf,
	signTest
} from './index';

describe('capability indices', () => {
	it('matches the NIST/SEMATECH e-Handbook §6.1.6 example', () => {
		// NIST/SEMATECH e-Handbook of Statistical Methods §6.1.6 "What is Process Capability?":
		// USL = 20, LSL = 8, mean = 16, s = 2 → Cp = 1.0, Cpk = 0.6667.
		const r = capabilityFrom(16, 2, { lsl: 8, usl: 20 });
		expect(r.cp).toBeCloseTo(1.0, 10);
		expect(r.cpk).toBeCloseTo(0.6667, 4);
		// Cpu and Cpl of the same example (from memory of the same NIST/SEMATECH §6.1.6 page).
		expect(r.cpu).toBeCloseTo(0.6667, 4);
		expect(r.cpl).toBeCloseTo(1.3333, 4);
	});

	it('gives Cp and Cpk from readings once there are enough, with mean and s as simple-statistics', () => {
		const values = Array.from({ length: 24 }, (_, i) => 88 + ((i * 7) % 9) - 4);
		const r = capability(values, { lsl: 80, usl: 96 });
		// Reference library: simple-statistics 7 (npm).
		expect(r.mean).toBeCloseTo(ss.mean(values), 12);
		expect(r.s).toBeCloseTo(ss.sampleStandardDeviation(values), 12);
		const s = ss.sampleStandardDeviation(values);
		const m = ss.mean(values);
		expect(r.cp).toBeCloseTo(16 / (6 * s), 12);
		expect(r.cpk).toBeCloseTo(Math.min((96 - m) / (3 * s), (m - 80) / (3 * s)), 12);
		expect(r.reason).toBeNull();
	});

	it('says why when there are fewer than 20 readings, no band or no spread', () => {
		const few = capability([80, 82, 84], { lsl: 80, usl: 96 });
		expect(few.cp).toBeNull();
		expect(few.cpk).toBeNull();
		expect(few.n).toBe(3);
		expect(few.reason).toMatch(/at least 20 readings; there are 3/);
		expect(capability(Array(MIN_CAPABILITY_N).fill(88), { lsl: 80, usl: 96 }).reason).toMatch(
			/no spread/
		);
		expect(capability([1, 2], { lsl: null, usl: null }).reason).toMatch(/no spec band/);
	});

	it('gives only Cpk for a one-sided spec', () => {
		const r = capabilityFrom(12.8, 0.1, { lsl: 12.4, usl: null });
		expect(r.cp).toBeNull();
		expect(r.cpk).toBeCloseTo(0.4 / 0.3, 10);
	});
});

describe('mean and sample standard deviation', () => {
	it('agree with simple-statistics on the vector [2, 4, 4, 4, 5, 5, 7, 9]', () => {
		// simple-statistics 7 (npm), run on this vector: mean 5, sample s 2.138089935299395.
		const v = [2, 4, 4, 4, 5, 5, 7, 9];
		expect(mean(v)).toBe(5);
		expect(sampleStdDev(v)).toBeCloseTo(2.138089935299395, 14);
	});

	it('agree with simple-statistics on random readings', () => {
		fc.assert(
			fc.property(
				fc.array(fc.double({ min: -1000, max: 1000, noNaN: true }), {
					minLength: 2,
					maxLength: 200
				}),
				(v) => {
					expect(mean(v)).toBeCloseTo(ss.mean(v), 6);
					expect(sampleStdDev(v)).toBeCloseTo(ss.sampleStandardDeviation(v), 6);
				}
			)
		);
	});
});

describe('sign test and side bias', () => {
	it('matches the binomial distribution of simple-statistics', () => {
		// Reference: simple-statistics binomialDistribution(n, 0.5) summed over the tails.
		for (const [above, below] of [
			[10, 2],
			[7, 7],
			[15, 0],
			[3, 9]
		]) {
			const n = above + below;
			const pmf = ss.binomialDistribution(n, 0.5) as number[];
			const k = Math.min(above, below);
			const tail = pmf.slice(0, k + 1).reduce((a, b) => a + b, 0);
			expect(signTest(above, below)).toBeCloseTo(Math.min(1, 2 * tail), 3);
		}
	});

	it('stays right for a window of thousands of readings', () => {
		// Normal approximation with continuity correction (NIST/SEMATECH e-Handbook §7.2.3.2 uses
		// it for large n): z = (|above − n/2| − 0.5) / (√n / 2); p = 2 (1 − Φ(z)), Φ from
		// simple-statistics. At n = 10,000 the exact test and the approximation agree closely.
		const z = (100 - 0.5) / 50;
		const approx = 2 * (1 - ss.cumulativeStdNormalProbability(z));
		expect(signTest(5100, 4900)).toBeCloseTo(approx, 3);
		expect(signTest(4900, 5100)).toBeCloseTo(approx, 3);
	});

	it('gives the same verdict from counts made in SQL as from the readings', () => {
		const readings = Array.from({ length: 30 }, (_, i) => ({ value: 88 + (i % 4), nominal: 88 }));
		const fromReadings = sideBias(readings);
		const deviations = readings.map((r) => ((r.value - r.nominal) / r.nominal) * 100);
		expect(
			sideBiasOf({
				n: readings.length,
				above: deviations.filter((d) => d > 0).length,
				below: 0,
				meanDeviationPct: ss.mean(deviations)
			})
		).toEqual({
			...fromReadings,
			meanDeviationPct: expect.closeTo(fromReadings.meanDeviationPct!, 9)
		});
		expect(capabilityOf(30, 10, 0.5, { lsl: 8, usl: 12 })).toMatchObject({ cp: 4 / 3, cpk: 4 / 3 });
	});

	it('calls out readings that sit above nominal, not a balanced tool', () => {
		const high = Array.from({ length: 20 }, (_, i) => ({ value: 92 + (i % 3), nominal: 88 }));
		expect(sideBias(high)).toMatchObject({ side: 'above', above: 20, below: 0 });
		expect(sideBias(high).meanDeviationPct).toBeGreaterThan(4);
		const balanced = Array.from({ length: 20 }, (_, i) => ({
			value: 88 + (i % 2 ? 1 : -1),
			nominal: 88
		}));
		expect(sideBias(balanced).side).toBeNull();
		// Too few readings to say anything, however one-sided.
		expect(sideBias(high.slice(0, 5)).side).toBeNull();
	});
});
