// The Jobs list's SQL paging against the in-memory reference (`jobPage`, filtering and paging
// by @tanstack/table-core) on the same job cards.
import { describe, expect, it } from 'vitest';
import { jobPage } from '$lib/jobs/table';
import { jobTableQuerySchema } from '$lib/schemas/job';
import { db } from './db';
import { makeShop } from './db/fixtures';
import * as s from './db/schema';
import { searchJobs } from './job-search';
import { listJobs } from './jobs';

describe('jobs search in SQL', () => {
	it('finds, filters and pages as the reference does', async () => {
		const f = await makeShop('Search');
		const customers = await db
			.insert(s.customer)
			.values(
				['Ada Quill', 'Bram Oakes', 'Cleo 100% Pike', 'Dev_Lund'].map((name) => ({
					shopId: f.shop.id,
					name
				}))
			)
			.returning();
		const vehicles = await db
			.insert(s.vehicle)
			.values(
				customers.map((c, i) => ({
					shopId: f.shop.id,
					customerId: c.id,
					registration: ['KS-41 AB', 'KS 7 QQ', 'MX 12-34', 'ZZ 9'][i],
					make: 'Demo make',
					model: 'Demo model'
				}))
			)
			.returning();
		await db.insert(s.job).values(
			Array.from({ length: 37 }, (_, i) => ({
				shopId: f.shop.id,
				number: 100 + i,
				customerId: customers[i % 4].id,
				vehicleId: vehicles[i % 4].id,
				technicianId: i % 3 === 0 ? f.tech.id : null,
				bay: i % 2 ? 'Bay 1' : 'Bay 2',
				state: (['open', 'in_work', 'paid', 'on_hold'] as const)[i % 4],
				createdAt: new Date(Date.UTC(2026, 10, 1 + (i % 20), 23, 30))
			}))
		);
		const all = await listJobs(f.shop.id);
		const queries: Record<string, string>[] = [
			{},
			{ page: '2' },
			{ page: '9' },
			{ size: '10', page: '3' },
			{ q: '10' },
			{ q: '#12' },
			{ q: 'ks41' },
			{ q: 'ks 7 q' },
			{ q: 'mx1234' },
			{ q: 'bram' },
			{ q: '100%' },
			{ q: 'dev_' },
			{ q: '_' },
			{ state: 'active' },
			{ state: 'paid', size: '10' },
			{ technician: f.tech.id },
			{ technician: 'none', bay: 'Bay 1' },
			{ from: '2026-11-05', to: '2026-11-07' },
			{ sort: 'number', dir: 'asc', page: '2', size: '10' }
		];
		for (const params of queries) {
			const query = jobTableQuerySchema.parse(params);
			const ref = jobPage(all, query);
			const got = await searchJobs(f.shop.id, query);
			expect({ q: params, rows: got.rows.map((r) => r.number), total: got.total }).toEqual({
				q: params,
				rows: ref.rows.map((r) => r.number),
				total: ref.total
			});
			expect([got.page, got.pageCount]).toEqual([ref.page, ref.pageCount]);
		}
	});
});
