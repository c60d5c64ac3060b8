import { describe, expect, it } from 'vitest';
import { readSpecCsv, readUnit } from './csv';

const header =
	'procedure,applies_to,flat_rate_hours,step,aliases,unit,nominal,min,max,tolerance,caution,part_code,part_quantity';
// the fluid column is optional: the first test has it, the rest read files without it
const withFluid = header.replace('caution,', 'caution,fluid,');

describe('spec table CSV', () => {
	it('groups rows into procedures and turns a tolerance into min and max', () => {
		const csv = [
			withFluid,
			'Brake pads (demo),Demo scooters,0.8,Caliper bolts,caliper,N.m,30,,,3,,,,',
			'Brake pads (demo),,,Brake fluid level,,,,,,,,DOT 4,,',
			'Coolant (demo),,0.5,Coolant fill,coolant,L,1.2,1.1,1.3,,Hot coolant scalds.,,CL-1,1.2'
		].join('\n');
		const r = readSpecCsv(csv);
		expect(r.ok).toBe(true);
		expect(r.procedures.map((p) => [p.name, p.flatRateHours, p.steps.length])).toEqual([
			['Brake pads (demo)', 0.8, 2],
			['Coolant (demo)', 0.5, 1]
		]);
		expect(r.procedures[0].steps[0]).toMatchObject({
			label: 'Caliper bolts',
			unit: 'N.m',
			nominal: 30,
			min: 27,
			max: 33,
			aliases: ['caliper']
		});
		expect(r.procedures[1].steps[0].part).toEqual({ code: 'CL-1', quantity: 1.2 });
		expect(r.procedures[0].steps[1].fluid).toBe('DOT 4');
	});

	it('reads a step adapter from adapter_mm and adapter_direction, and names what is missing', () => {
		const withAdapter = header.replace('caution,', 'caution,adapter_mm,adapter_direction,');
		const csv = [
			withAdapter,
			'Brake lines (demo),,,Brake line flare nut,,N.m,16,,,,,45,square,,',
			'Brake lines (demo),,,Union bolt,,N.m,20,,,,,50,Back,,',
			'Brake lines (demo),,,Bleed nipple,,N.m,6,,,,,,,,'
		].join('\n');
		const r = readSpecCsv(csv);
		expect(r.ok).toBe(true);
		expect(r.procedures[0].steps.map((s) => s.adapter)).toEqual([
			{ lengthMm: 45, direction: 'square' },
			{ lengthMm: 50, direction: 'back' },
			null
		]);
		const bad = readSpecCsv(
			[
				withAdapter,
				'Brake lines (demo),,,Flare nut,,N.m,16,,,,,45,,,',
				'Brake lines (demo),,,Union bolt,,N.m,20,,,,,,out,,',
				'Brake lines (demo),,,Bleed nipple,,N.m,6,,,,,2000,out,,'
			].join('\n')
		);
		expect(bad.ok).toBe(false);
		expect(bad.rows.map((row) => row.problems.map((p) => p.column))).toEqual([
			['adapter_direction'],
			['adapter_mm'],
			['adapter_mm']
		]);
		expect(bad.rows[2].problems[0].message).toBe('The adapter length is at most 1000 mm.');
	});

	it("lists every row's problems with row and column, and imports nothing", () => {
		const csv = [
			header,
			'Brake pads (demo),,,Caliper bolts,,N.m,30,,,,,,',
			'Brake pads (demo),,,Disc bolts,,furlongs,abc,,,,,,',
			'Brake pads (demo),,,,,N.m,,40,20,,,,'
		].join('\n');
		const r = readSpecCsv(csv);
		expect(r.ok).toBe(false);
		expect(r.procedures).toEqual([]);
		expect(r.rows[0].problems).toEqual([]);
		expect(r.rows[1].problems).toEqual([
			{ row: 3, column: 'unit', message: "Benchcall does not know the unit 'furlongs'." },
			{ row: 3, column: 'nominal', message: "'abc' is not a number." }
		]);
		expect(r.rows[2].problems).toEqual(
			expect.arrayContaining([
				{ row: 4, column: 'step', message: 'Name the step.' },
				{ row: 4, column: 'max', message: 'Max must not be less than min.' }
			])
		);
	});

	it('refuses a table without the needed columns', () => {
		const r = readSpecCsv('name,value\nx,1');
		expect(r.ok).toBe(false);
		expect(r.fileProblems.map((p) => p.column)).toEqual(['procedure', 'step', null]);
	});

	it('reads units as codes, trade symbols or words', () => {
		expect(readUnit('N.m')).toBe('N.m');
		expect(readUnit('N·m')).toBe('N.m');
		expect(readUnit('lbf·ft')).toBe('[lbf_av].[ft_i]');
		expect(readUnit('mm')).toBe('mm');
		expect(readUnit('parsecs')).toBeNull();
	});
});
