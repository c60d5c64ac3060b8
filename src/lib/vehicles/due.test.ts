import { describe, expect, it } from 'vitest';
import { addMonths, dailyUse, serviceDue } from './due';

const d = (s: string) => new Date(`${s}T09:00:00Z`);
const oil = {
	procedureId: 'p1',
	name: 'Oil and filter (demo)',
	intervalKm: 6000,
	intervalMonths: 12
};
const valves = {
	procedureId: 'p2',
	name: 'Valve clearance (demo)',
	intervalKm: 24000,
	intervalMonths: null
};

describe('service due', () => {
	it('adds calendar months and keeps month ends (31 Jan + 1 month = 29 Feb 2028)', () => {
		// 2028 is a leap year (Gregorian rule: divisible by 4, not a century): common practice.
		expect(addMonths(d('2028-01-31'), 1).toISOString().slice(0, 10)).toBe('2028-02-29');
		expect(addMonths(d('2026-11-15'), 12).toISOString().slice(0, 10)).toBe('2027-11-15');
	});

	it('is due by months when the vehicle is little used', () => {
		const items = serviceDue(
			[oil],
			[{ procedureId: 'p1', jobNumber: 7, on: d('2025-12-20'), odometer: 10_000 }],
			[
				{ on: d('2025-12-20'), odometer: 10_000 },
				{ on: d('2026-06-20'), odometer: 11_000 }
			],
			d('2026-12-04')
		);
		expect(items[0]).toMatchObject({ state: 'due_soon', dueAtOdometer: 16_000, lastJobNumber: 7 });
		expect(items[0].nextOn?.toISOString().slice(0, 10)).toBe('2026-12-20');
	});

	it('is due by distance first when the vehicle rides a lot', () => {
		// 10,000 km to 13,000 km in 100 days = 30 km a day; 3,000 km to go → 100 days later.
		const items = serviceDue(
			[oil],
			[{ procedureId: 'p1', jobNumber: 3, on: d('2026-06-01'), odometer: 10_000 }],
			[
				{ on: d('2026-06-01'), odometer: 10_000 },
				{ on: d('2026-09-09'), odometer: 13_000 }
			],
			d('2026-12-04')
		);
		expect(
			dailyUse([
				{ on: d('2026-06-01'), odometer: 10_000 },
				{ on: d('2026-09-09'), odometer: 13_000 }
			])
		).toBeCloseTo(30, 9);
		expect(items[0].expectedOn?.toISOString().slice(0, 10)).toBe('2026-12-18');
		expect(items[0].state).toBe('due_soon');
	});

	it('is overdue once the odometer passed the distance, and unknown when never done here', () => {
		const items = serviceDue(
			[oil, valves],
			[{ procedureId: 'p1', jobNumber: 3, on: d('2026-10-01'), odometer: 10_000 }],
			[{ on: d('2026-11-30'), odometer: 16_200 }],
			d('2026-12-04')
		);
		expect(items.map((i) => [i.name, i.state])).toEqual([
			['Oil and filter (demo)', 'overdue'],
			['Valve clearance (demo)', 'unknown']
		]);
	});
});
