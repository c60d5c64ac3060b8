import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { intakeSchema } from '$lib/schemas/job';
import { getJobCard } from '../job-card-view';
import { addExtraWork, createJobCard } from '../job-cards';
import {
	exportProcedures,
	importProcedures,
	listProcedures,
	saveStep,
	getProcedure,
	deleteStep
} from '../procedures';
import { db } from './index';
import { makeShop } from './fixtures';
import * as s from './schema';

async function shopWithProcedure() {
	const f = await makeShop('Jobs');
	const [p] = await db
		.insert(s.part)
		.values({ shopId: f.shop.id, code: 'DPW-12', description: 'Drain plug washer', priceMinor: 90 })
		.returning();
	const imported = await importProcedures(f.shop.id, [
		{
			name: 'Oil change (test)',
			appliesTo: '',
			flatRateHours: 0.7,
			steps: [
				{
					label: 'Drain plug',
					aliases: ['sump plug'],
					unit: 'N.m',
					nominal: 24,
					min: 22,
					max: 26,
					caution: null,
					fluid: null,
					adapter: null,
					part: { code: 'DPW-12', quantity: 1 }
				},
				{
					label: 'Oil fill',
					aliases: [],
					unit: 'L',
					nominal: 1.1,
					min: null,
					max: null,
					caution: null,
					fluid: null,
					adapter: null,
					part: null
				}
			]
		}
	]);
	if (!imported.ok) throw new Error('import failed');
	return { ...f, partId: p.id, procedureId: imported.created[0].id };
}

const intake = (over: Record<string, unknown>) =>
	intakeSchema.parse({
		pick: 'new',
		customerName: 'Walk-in Customer',
		registration: 'ks 42',
		make: 'Demo',
		model: 'Two',
		concern: 'Service due',
		...over
	});

describe('job cards', () => {
	it("copies a procedure's steps so later library edits never change the job", async () => {
		const f = await shopWithProcedure();
		const r = await createJobCard(
			f.shop.id,
			f.owner.id,
			intake({ procedureIds: [f.procedureId], technicianId: f.tech.id })
		);
		expect(r).toMatchObject({ ok: true, number: 2 });
		if (!r.ok) return;
		const before = await getJobCard(f.shop.id, r.number);
		expect(before?.procedures[0].steps.map((x) => [x.label, x.min, x.max])).toEqual([
			['Drain plug', 22, 26],
			['Oil fill', null, null]
		]);
		expect(before?.vehicle?.registration).toBe('KS 42');

		const lib = await getProcedure(f.shop.id, f.procedureId);
		const drain = lib!.steps[0];
		await saveStep(f.shop.id, f.procedureId, {
			stepId: drain.id,
			label: 'Drain plug (changed)',
			aliases: [],
			unit: 'N.m',
			nominal: 30,
			min: null,
			max: null,
			plusMinus: 1,
			caution: 'new caution',
			fluid: '',
			adapterLengthMm: null,
			adapterDirection: '',
			partId: '',
			partQuantity: null
		});
		await deleteStep(f.shop.id, f.procedureId, lib!.steps[1].id);
		await db.update(s.procedure).set({ name: 'Renamed' }).where(eq(s.procedure.id, f.procedureId));

		const after = await getJobCard(f.shop.id, r.number);
		expect(after?.procedures[0].name).toBe('Oil change (test)');
		expect(
			after?.procedures[0].steps.map((x) => [x.label, x.nominal, x.min, x.max, x.caution, x.partId])
		).toEqual([
			['Drain plug', 24, 22, 26, null, f.partId],
			['Oil fill', 1.1, null, null, null, null]
		]);
		const libAfter = await getProcedure(f.shop.id, f.procedureId);
		expect(libAfter!.steps.map((x) => [x.label, x.min, x.max])).toEqual([
			['Drain plug (changed)', 29, 31]
		]);
	});

	it('gives distinct job numbers to cards opened at the same moment', async () => {
		const f = await shopWithProcedure();
		const results = await Promise.all(
			Array.from({ length: 6 }, () => createJobCard(f.shop.id, f.owner.id, intake({})))
		);
		const numbers = results.map((r) => (r.ok ? r.number : -1)).sort((a, b) => a - b);
		expect(numbers).toEqual([2, 3, 4, 5, 6, 7]);
	});

	it('records the approval before adding extra work, and refuses a foreign procedure', async () => {
		const f = await shopWithProcedure();
		const other = await shopWithProcedure();
		const input = {
			procedureId: f.procedureId,
			description: 'Oil change found due',
			approvedBy: 'Customer',
			channel: 'phone',
			approvedAt: new Date()
		};
		expect(await addExtraWork(f.shop.id, f.owner.id, f.job.id, input)).toEqual({ ok: true });
		const card = await getJobCard(f.shop.id, 1);
		expect(card?.approvals.map((a) => [a.description, a.channel, a.recordedByName])).toEqual([
			['Oil change found due', 'phone', 'Owner']
		]);
		expect(card?.procedures.map((p) => p.steps.length)).toEqual([1, 2]);
		const refused = await addExtraWork(f.shop.id, f.owner.id, f.job.id, {
			...input,
			procedureId: other.procedureId
		});
		expect(refused.ok).toBe(false);
		expect((await getJobCard(f.shop.id, 1))?.approvals).toHaveLength(1);
	});

	it('imports nothing when one part code is unknown, and exports what it imported', async () => {
		const f = await shopWithProcedure();
		const before = await listProcedures(f.shop.id);
		const r = await importProcedures(f.shop.id, [
			{ name: 'Good one', appliesTo: '', flatRateHours: 0, steps: [] },
			{
				name: 'Bad one',
				appliesTo: '',
				flatRateHours: 0,
				steps: [
					{
						label: 'x',
						aliases: [],
						unit: null,
						nominal: null,
						min: null,
						max: null,
						caution: null,
						fluid: null,
						adapter: null,
						part: { code: 'NOPE', quantity: 1 }
					}
				]
			}
		]);
		expect(r).toEqual({
			ok: false,
			kind: 'unprocessable',
			message: '1 problem in the file: nothing was saved.',
			problems: [
				{
					where: 'procedures[1].steps[0].part.code',
					message: "The part code 'NOPE' is not on the price list."
				}
			]
		});
		expect(await listProcedures(f.shop.id)).toEqual(before);
		const file = await exportProcedures(f.shop.id);
		expect(file.procedures[0].steps[0]).toMatchObject({
			label: 'Drain plug',
			part: { code: 'DPW-12', quantity: 1 }
		});
	});
});
