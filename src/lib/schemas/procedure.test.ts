import { describe, expect, it } from 'vitest';
import {
	PROCEDURE_FILE_FORMAT,
	procedureFileJsonSchema,
	readProcedureFile,
	stepFormSchema
} from './procedure';

const good = {
	format: PROCEDURE_FILE_FORMAT,
	version: 1,
	procedures: [
		{
			name: 'Front wheel refit',
			appliesTo: 'Demo scooters',
			flatRateHours: 0.5,
			steps: [
				{ label: 'Front axle nut', unit: 'N.m', nominal: 60, min: 55, max: 65 },
				{ label: 'Test ride' }
			]
		}
	]
};

describe('procedure file', () => {
	it('reads a good file and fills defaults', () => {
		const r = readProcedureFile(JSON.stringify(good));
		expect(r.ok).toBe(true);
		if (!r.ok) return;
		expect(r.file.procedures[0].steps[1]).toEqual({
			label: 'Test ride',
			aliases: [],
			unit: null,
			nominal: null,
			min: null,
			max: null,
			caution: null,
			fluid: null,
			adapter: null,
			part: null
		});
	});

	it('keeps a step fluid spec and names a spec that is not a grade (SAE J300, FMVSS 116)', () => {
		const withFluid = structuredClone(good);
		(withFluid.procedures[0].steps[1] as Record<string, unknown>).fluid = 'SAE 10W-40, JASO MA2';
		const r = readProcedureFile(JSON.stringify(withFluid));
		expect(r.ok && r.file.procedures[0].steps[1].fluid).toBe('SAE 10W-40, JASO MA2');
		(withFluid.procedures[0].steps[1] as Record<string, unknown>).fluid = 'DOT 6';
		const bad = readProcedureFile(JSON.stringify(withFluid));
		expect(bad).toMatchObject({
			ok: false,
			problems: [{ where: 'procedures[0].steps[1].fluid' }]
		});
		expect(!bad.ok && bad.problems[0].message).toContain('DOT 6 is not a brake fluid class');
	});

	it('keeps a step adapter and says where a bad one is', () => {
		const withAdapter = structuredClone(good);
		(withAdapter.procedures[0].steps[0] as Record<string, unknown>).adapter = {
			lengthMm: 45,
			direction: 'back'
		};
		const r = readProcedureFile(JSON.stringify(withAdapter));
		expect(r.ok && r.file.procedures[0].steps[0].adapter).toEqual({
			lengthMm: 45,
			direction: 'back'
		});
		(withAdapter.procedures[0].steps[0] as Record<string, unknown>).adapter = {
			lengthMm: 45,
			direction: 'sideways'
		};
		const bad = readProcedureFile(JSON.stringify(withAdapter));
		expect(bad).toMatchObject({
			ok: false,
			problems: [
				{
					where: 'procedures[0].steps[0].adapter.direction',
					message: 'The adapter direction is out, back or square.'
				}
			]
		});
	});

	it('says where each problem is', () => {
		const bad = structuredClone(good) as Record<string, unknown> & typeof good;
		(bad.procedures[0].steps[0] as Record<string, unknown>).unit = 'newtons';
		(bad.procedures[0].steps[0] as Record<string, unknown>).min = 70;
		const r = readProcedureFile(JSON.stringify(bad));
		expect(r.ok).toBe(false);
		if (r.ok) return;
		expect(r.problems).toEqual(
			expect.arrayContaining([
				{
					where: 'procedures[0].steps[0].unit',
					message: expect.stringContaining("does not know the unit 'newtons'")
				},
				{ where: 'procedures[0].steps[0].max', message: 'Max must not be less than min.' }
			])
		);
	});

	it('refuses other formats, versions and broken JSON with a message', () => {
		const r1 = readProcedureFile(JSON.stringify({ ...good, version: 2 }));
		expect(r1).toMatchObject({ ok: false, problems: [{ where: 'version' }] });
		const r2 = readProcedureFile('{"format": ');
		expect(r2).toMatchObject({ ok: false, problems: [{ where: 'file' }] });
		const r3 = readProcedureFile(JSON.stringify({ ...good, format: 'something-else' }));
		expect(r3).toMatchObject({ ok: false, problems: [{ where: 'format' }] });
	});

	it('generates a JSON Schema from the zod schema', () => {
		const schema = procedureFileJsonSchema() as Record<string, unknown>;
		expect(schema.title).toBe('Benchcall procedure file');
		expect(JSON.stringify(schema)).toContain('"flatRateHours"');
		expect(JSON.stringify(schema)).toContain('"fluid"');
		expect(JSON.stringify(schema)).toContain('"adapter"');
		expect((schema.required as string[]).sort()).toEqual(['format', 'procedures', 'version']);
	});
});

describe('step form', () => {
	it('stores a ± tolerance as min and max and splits aliases', () => {
		const r = stepFormSchema.safeParse({
			label: 'Drain plug',
			aliases: 'sump plug, drain',
			unit: 'N.m',
			nominal: '24',
			plusMinus: '2'
		});
		expect(r.success).toBe(true);
		expect(r.data?.aliases).toEqual(['sump plug', 'drain']);
	});

	it('puts errors beside the field', () => {
		const r = stepFormSchema.safeParse({ label: 'x', unit: 'N.m', min: '30', max: '20' });
		expect(r.error?.issues[0]).toMatchObject({ path: ['max'] });
		const r2 = stepFormSchema.safeParse({ label: 'x', nominal: '3' });
		expect(r2.error?.issues[0]).toMatchObject({ path: ['unit'], message: 'A value needs a unit.' });
	});

	it('takes an adapter as a length with its direction, and says which one is missing', () => {
		const ok = stepFormSchema.safeParse({
			label: 'Brake line flare nut',
			unit: 'N.m',
			nominal: '16',
			adapterLengthMm: '45',
			adapterDirection: 'square'
		});
		expect(ok.data).toMatchObject({ adapterLengthMm: 45, adapterDirection: 'square' });
		const noDirection = stepFormSchema.safeParse({ label: 'x', adapterLengthMm: '45' });
		expect(noDirection.error?.issues[0]).toMatchObject({ path: ['adapterDirection'] });
		const noLength = stepFormSchema.safeParse({ label: 'x', adapterDirection: 'out' });
		expect(noLength.error?.issues[0]).toMatchObject({ path: ['adapterLengthMm'] });
		const tooLong = stepFormSchema.safeParse({
			label: 'x',
			adapterLengthMm: '1200',
			adapterDirection: 'out'
		});
		expect(tooLong.error?.issues[0]?.message).toBe('The adapter length is at most 1000 mm.');
		const sideways = stepFormSchema.safeParse({
			label: 'x',
			adapterLengthMm: '45',
			adapterDirection: 'sideways'
		});
		expect(sideways.success).toBe(false);
	});
});
