// An adapter on the step (a crowfoot the procedure calls for): kept through the library, the
// procedure file and the job's copy, and recorded on an entry like an adapter said at the bench.
import { and, eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { intakeSchema } from '$lib/schemas/job';
import { db } from './db';
import { addTorqueTool, entryOf, makeShop } from './db/fixtures';
import * as s from './db/schema';
import type { Actor } from './bench/job';
import { appendEntry } from './log/append';
import { createJobCard } from './job-cards';
import { exportProcedures, getProcedure, importProcedures, saveStep } from './procedures';

type Fixture = Awaited<ReturnType<typeof makeShop>>;
const tech = (f: Fixture): Actor => ({ id: f.tech.id, shopId: f.shop.id, role: 'technician' });
const post = (text: string, torqueToolId?: string) => ({
	id: crypto.randomUUID(),
	text,
	source: 'typed' as const,
	...(torqueToolId ? { torqueToolId } : {})
});

const step = {
	label: 'Brake line flare nut',
	aliases: [],
	unit: 'N.m',
	nominal: 16,
	min: null,
	max: null,
	caution: null,
	fluid: null,
	part: null
};

describe("a step's adapter in the procedure library", () => {
	it('imports, exports, edits and copies onto a job', async () => {
		const f = await makeShop('Step adapter');
		const imported = await importProcedures(f.shop.id, [
			{
				name: 'Brake lines (test)',
				appliesTo: '',
				flatRateHours: 0.5,
				steps: [
					{ ...step, adapter: { lengthMm: 45, direction: 'square' } },
					{ ...step, label: 'Bleed nipple', nominal: 6, adapter: null }
				]
			}
		]);
		if (!imported.ok) throw new Error('import failed');
		const procedureId = imported.created[0].id;
		const lib = await getProcedure(f.shop.id, procedureId);
		expect(lib!.steps.map((x) => [x.adapterLengthMm, x.adapterDirection])).toEqual([
			[45, 'square'],
			[null, null]
		]);
		const file = await exportProcedures(f.shop.id, [procedureId]);
		expect(file.procedures[0].steps.map((x) => x.adapter)).toEqual([
			{ lengthMm: 45, direction: 'square' },
			null
		]);

		// the editor: a length and a direction; a job card opened afterwards copies them
		const saved = await saveStep(f.shop.id, procedureId, {
			stepId: lib!.steps[1].id,
			label: 'Bleed nipple',
			aliases: [],
			unit: 'N.m',
			nominal: 6,
			min: null,
			max: null,
			plusMinus: null,
			caution: '',
			fluid: '',
			adapterLengthMm: 38.5,
			adapterDirection: 'back',
			partId: '',
			partQuantity: null
		});
		expect(saved.ok).toBe(true);
		const card = await createJobCard(
			f.shop.id,
			f.owner.id,
			intakeSchema.parse({
				pick: 'new',
				customerName: 'Walk-in Customer',
				registration: 'ks 43',
				make: 'Demo',
				model: 'Two',
				concern: 'Brake lines',
				procedureIds: [procedureId]
			})
		);
		if (!card.ok) throw new Error('no job card');
		const copied = await db
			.select({
				label: s.jobStep.label,
				length: s.jobStep.adapterLengthMm,
				direction: s.jobStep.adapterDirection
			})
			.from(s.jobStep)
			.innerJoin(s.job, eq(s.job.id, s.jobStep.jobId))
			.where(and(eq(s.job.shopId, f.shop.id), eq(s.job.number, card.number)))
			.orderBy(s.jobStep.position);
		expect(copied).toEqual([
			{ label: 'Brake line flare nut', length: 45, direction: 'square' },
			{ label: 'Bleed nipple', length: 38.5, direction: 'back' }
		]);
	});

	it('the database refuses a length without a direction, or out of range (drizzle/0014)', async () => {
		const f = await makeShop('Step adapter');
		for (const bad of [
			{ adapterLengthMm: 45, adapterDirection: null },
			{ adapterLengthMm: null, adapterDirection: 'out' },
			{ adapterLengthMm: 45, adapterDirection: 'sideways' },
			{ adapterLengthMm: 1001, adapterDirection: 'out' },
			{ adapterLengthMm: -1, adapterDirection: 'out' }
		]) {
			await expect(
				db.update(s.jobStep).set(bad).where(eq(s.jobStep.id, f.step.id)),
				JSON.stringify(bad)
			).rejects.toMatchObject({ cause: { constraint_name: 'job_step_adapter_check' } });
		}
	});
});

describe("an entry on a step with its own adapter (the fixture's tool: 300 mm)", () => {
	async function withStepAdapter(lengthMm: number, direction: 'out' | 'back' | 'square') {
		const f = await makeShop('Step adapter');
		await db
			.update(s.jobStep)
			.set({ adapterLengthMm: lengthMm, adapterDirection: direction })
			.where(eq(s.jobStep.id, f.step.id));
		const tool = await addTorqueTool(f);
		return { f, tool };
	}

	it('is recorded as a said adapter is: length, tool length and setting', async () => {
		const { f, tool } = await withStepAdapter(50, 'out');
		const e = entryOf(await appendEntry(tech(f), f.job.id, post('rear axle 88 nm', tool.id)));
		expect(e).toMatchObject({ specValue: 88, verdict: 'in', adapterMm: 50, toolLengthMm: 300 });
		// T × L / (L + E), the formula of US Army TM 1-1500-204-23-9's worked example
		expect(e.wrenchSetting).toBeCloseTo((88 * 300) / 350, 10);
		expect(e.wrenchSettingUnit).toBe('N.m');
		// the same phrase with the adapter said gives the same record
		const said = entryOf(
			await appendEntry(tech(f), f.job.id, post('rear axle 88 nm adapter 50 mm', tool.id))
		);
		expect([said.adapterMm, said.toolLengthMm, said.wrenchSetting]).toEqual([
			e.adapterMm,
			e.toolLengthMm,
			e.wrenchSetting
		]);
	});

	it('is kept without a tool too, also once the job is known to this process', async () => {
		const { f } = await withStepAdapter(38.5, 'back');
		// the first append reads the job; the next could take the quick path, which writes no adapter
		const first = entryOf(await appendEntry(tech(f), f.job.id, post('rear axle 85 nm')));
		const again = entryOf(await appendEntry(tech(f), f.job.id, post('rear axle 86 nm')));
		for (const e of [first, again]) {
			expect(e).toMatchObject({ adapterMm: -38.5, toolLengthMm: null, wrenchSetting: null });
		}
		// a note on the same job keeps none
		const note = entryOf(await appendEntry(tech(f), f.job.id, post('note flare nut re-seated')));
		expect(note.adapterMm).toBeNull();
	});

	it('gives way to an adapter said or picked at the bench', async () => {
		const { f, tool } = await withStepAdapter(50, 'out');
		const said = entryOf(
			await appendEntry(tech(f), f.job.id, post('rear axle 88 nm crowfoot at 90', tool.id))
		);
		expect(said).toMatchObject({ adapterMm: 0, wrenchSetting: 88 });
		const picked = entryOf(
			await appendEntry(tech(f), f.job.id, { ...post('rear axle 88 nm', tool.id), adapterMm: -50 })
		);
		expect(picked.adapterMm).toBe(-50);
		expect(picked.wrenchSetting).toBeCloseTo((88 * 300) / 250, 10);
	});
});
