import { describe, expect, it } from 'vitest';
import { db } from './db';
import { makeShop } from './db/fixtures';
import * as s from './db/schema';
import { workReport } from './work-report';

describe('the work report', () => {
	it('shows a value called in another unit beside its value in the spec unit', async () => {
		const f = await makeShop('Report units');
		await db.insert(s.logEntry).values({
			id: crypto.randomUUID(),
			shopId: f.shop.id,
			jobId: f.job.id,
			jobStepId: f.step.id,
			authorId: f.tech.id,
			kind: 'measure',
			rawText: 'rear axle 65 foot pounds',
			source: 'typed',
			value: 65,
			unit: '[lbf_av].[ft_i]',
			// NIST SP 811 (B.9): 1 lbf·ft = 1.355818 N·m, so 65 lbf·ft = 88.128 N·m
			specValue: 65 * 1.355818,
			specUnit: 'N.m',
			verdict: 'in',
			occurredAt: new Date()
		});
		const report = await workReport(f.shop.id, f.job.id);
		const entries = report.procedures.flatMap((p) => p.steps.flatMap((st) => st.entries));
		expect(entries.map((e) => e.value)).toEqual(['65 lbf·ft = 88.13 N·m']);
	});
});
