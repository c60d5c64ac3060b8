import { describe, expect, it } from 'vitest';
import { jobTableQuerySchema } from '$lib/schemas/job';
import { jobPage, type JobRow } from './table';

const tech = '11111111-1111-4111-8111-111111111111';
function row(n: number, over: Partial<JobRow> = {}): JobRow {
	return {
		id: `id-${n}`,
		number: n,
		state: 'open',
		bay: null,
		concern: '',
		createdAt: new Date(Date.UTC(2026, 10, n)),
		technicianId: null,
		technicianName: null,
		customerName: `Customer ${n}`,
		registration: `KS ${String.fromCharCode(65 + (n % 26))}${String.fromCharCode(65 + Math.floor(n / 26))}`,
		vehicle: null,
		stepsTotal: 0,
		stepsDone: 0,
		outOfSpec: 0,
		...over
	};
}
const q = (params: Record<string, string>) => jobTableQuerySchema.parse(params);
const data = Array.from({ length: 30 }, (_, i) => row(i + 1));

describe('jobs table', () => {
	it('sorts newest number first and pages by 25 by default', () => {
		const p = jobPage(data, q({}));
		expect(p.total).toBe(30);
		expect(p.pageCount).toBe(2);
		expect(p.rows[0].number).toBe(30);
		expect(p.rows).toHaveLength(25);
		const p2 = jobPage(data, q({ page: '2' }));
		expect(p2.rows.map((r) => r.number)).toEqual([5, 4, 3, 2, 1]);
	});

	it('searches number, registration (spaces ignored) and customer', () => {
		expect(jobPage(data, q({ q: '12' })).rows.map((r) => r.number)).toEqual([12]);
		expect(jobPage(data, q({ q: 'ksha' })).rows.map((r) => r.number)).toEqual([7]);
		expect(jobPage(data, q({ q: 'customer 3' })).rows.map((r) => r.number)).toEqual([30, 3]);
	});

	it('filters by state, technician, bay and date', () => {
		const d = [
			row(1, { state: 'in_work', technicianId: tech, bay: 'Bay 1' }),
			row(2, { state: 'paid' }),
			row(3, { state: 'on_hold', bay: 'Bay 2' })
		];
		expect(jobPage(d, q({ state: 'active' })).rows.map((r) => r.number)).toEqual([3, 1]);
		expect(jobPage(d, q({ state: 'paid' })).rows.map((r) => r.number)).toEqual([2]);
		expect(jobPage(d, q({ technician: tech })).rows.map((r) => r.number)).toEqual([1]);
		expect(jobPage(d, q({ technician: 'none' })).rows.map((r) => r.number)).toEqual([3, 2]);
		expect(jobPage(d, q({ bay: 'Bay 2' })).rows.map((r) => r.number)).toEqual([3]);
		expect(
			jobPage(d, q({ from: '2026-11-02', to: '2026-11-02' })).rows.map((r) => r.number)
		).toEqual([2]);
	});

	it('sorts by a column either way and falls back on bad query values', () => {
		const d = [row(1, { customerName: 'Bo' }), row(2, { customerName: 'Al' })];
		expect(jobPage(d, q({ sort: 'customer', dir: 'asc' })).rows.map((r) => r.number)).toEqual([
			2, 1
		]);
		const bad = q({ sort: 'nonsense', dir: 'sideways', page: '-3', size: '7' });
		expect(bad).toMatchObject({ sort: 'number', dir: 'desc', page: 1, size: 25 });
		expect(jobPage(data, q({ page: '99' })).page).toBe(2);
	});
});
