import ucum from '@lhncbc/ucum-lhc';
import { describe, expect, it } from 'vitest';
import { buildDraftLines, fluidQuantity, type LogRow, type PriceListPart } from './draft';
import { liveEntries } from '$lib/log/live';

const ucumUtils = ucum.UcumLhcUtils.getInstance();

const parts: PriceListPart[] = [
	{
		id: 'oil',
		code: 'OIL-1040',
		description: 'Engine oil 10W-40 (bulk)',
		unit: 'L',
		priceMinor: 1490,
		active: true
	},
	{
		id: 'washer',
		code: 'DPW-12',
		description: 'Drain plug sealing washer 12 mm',
		unit: 'each',
		priceMinor: 120,
		active: true
	},
	{
		id: 'chain',
		code: 'CH-428',
		description: 'Drive chain 428, 118 links',
		unit: 'each',
		priceMinor: 3950,
		active: true
	},
	{
		id: 'brake',
		code: 'BRK-4',
		description: 'Brake fluid DOT 4 (bulk)',
		unit: 'mL',
		priceMinor: 2,
		active: true
	}
];

let n = 0;
function entry(p: Partial<LogRow>): LogRow {
	n++;
	return {
		id: `e${n}`,
		kind: 'measure',
		jobStepId: null,
		authorId: 'tech',
		value: null,
		unit: null,
		partId: null,
		partQuantity: null,
		rawText: '',
		note: null,
		retracts: null,
		occurredAt: new Date(Date.UTC(2026, 11, 1, 9, n * 5)),
		...p
	};
}

describe('fluid quantities in the price-list unit', () => {
	it('bills 1.1 US qt of oil as 1.041 L', () => {
		// Oracle: @lhncbc/ucum-lhc gives 1.1 [qt_us] = 1.0409882… L; billed to the millilitre.
		const oracle = ucumUtils.convertUnitTo('[qt_us]', 1.1, 'L').toVal as number;
		expect(oracle).toBeCloseTo(1.04098824, 8);
		expect(fluidQuantity(1.1, '[qt_us]', 'L')).toBe(Math.round(oracle * 1000) / 1000);
		expect(fluidQuantity(1.1, '[qt_us]', 'L')).toBe(1.041);
	});
	it('converts into millilitres and from imperial pints, checked against ucum-lhc', () => {
		for (const [v, from, to] of [
			[0.25, 'L', 'mL'],
			[1, '[pt_br]', 'mL'],
			[2, '[foz_us]', 'mL']
		] as const) {
			const oracle = ucumUtils.convertUnitTo(from, v, to).toVal as number;
			expect(fluidQuantity(v, from, to), `${v} ${from}`).toBe(Math.round(oracle));
		}
	});
	it('gives nothing for a unit of another kind or a part sold each', () => {
		expect(fluidQuantity(24, 'N.m', 'L')).toBeNull();
		expect(fluidQuantity(1, 'L', 'each')).toBeNull();
	});
});

describe('draft lines from the log', () => {
	const steps = [
		{ id: 's-plug', label: 'Drain plug', position: 1, partId: 'washer', partQuantity: 1 },
		{ id: 's-oil', label: 'Oil fill', position: 2, partId: 'oil', partQuantity: 1.1 },
		{ id: 's-valve', label: 'Valve clearance', position: 3, partId: null, partQuantity: null },
		{ id: 's-brake', label: 'Brake bleed', position: 4, partId: 'brake', partQuantity: 250 }
	];
	const base = {
		parts,
		steps,
		procedures: [{ id: 'p1', name: 'Periodic service', flatRateHours: 1.5 }],
		technicianNames: new Map([
			['tech', 'Rin'],
			['tech2', 'Ola']
		]),
		labourRateMinor: 7200,
		idleGapMinutes: 30
	};

	it('bills done steps with parts, converts the fluid, skips undone and retracted, flat rate', () => {
		const plug = entry({ jobStepId: 's-plug', value: 24, unit: 'N.m' });
		const wrongOil = entry({ jobStepId: 's-oil', value: 1.4, unit: '[qt_us]' });
		const retraction = entry({ kind: 'retraction', retracts: wrongOil.id });
		const oil = entry({ jobStepId: 's-oil', value: 1.1, unit: '[qt_us]' });
		const lines = buildDraftLines({
			...base,
			entries: [plug, wrongOil, retraction, oil],
			labourMode: 'flat_rate'
		});
		expect(lines.map((l) => [l.kind, l.partId, l.quantity, l.unit, l.unitPriceMinor])).toEqual([
			['part', 'washer', 1, 'each', 120],
			['fluid', 'oil', 1.041, 'L', 1490],
			['labour', null, 1.5, 'h', 7200]
		]);
	});

	it('uses the step quantity when the step was done without a volume, and never bills twice', () => {
		const brake = entry({ jobStepId: 's-brake', kind: 'done' });
		const washerEntry = entry({
			jobStepId: 's-plug',
			kind: 'part',
			partId: 'washer',
			partQuantity: 2
		});
		const lines = buildDraftLines({
			...base,
			entries: [brake, washerEntry],
			labourMode: 'flat_rate'
		});
		expect(lines.filter((l) => l.kind !== 'labour').map((l) => [l.partId, l.quantity])).toEqual([
			['brake', 250],
			['washer', 2]
		]);
	});

	it('matches an unlinked part entry by its words, and lists what it cannot match', () => {
		const chain = entry({ kind: 'part', rawText: 'fitted new drive chain 428', partQuantity: 1 });
		const odd = entry({ kind: 'part', rawText: 'mirror stem left', partQuantity: 1 });
		const lines = buildDraftLines({ ...base, entries: [chain, odd], labourMode: 'flat_rate' });
		const partsOnly = lines.filter((l) => l.kind === 'part');
		expect(partsOnly[0]).toMatchObject({ partId: 'chain', unmatched: false, unitPriceMinor: 3950 });
		expect(partsOnly[1]).toMatchObject({
			partId: null,
			unmatched: true,
			description: 'mirror stem left',
			unitPriceMinor: 0
		});
	});

	it('takes clock time per technician, leaving idle gaps and decisions out', () => {
		const t = (h: number, m: number) => new Date(Date.UTC(2026, 11, 1, h, m));
		const entries = [
			entry({ authorId: 'tech', kind: 'done', occurredAt: t(9, 0) }),
			entry({ authorId: 'tech', kind: 'measure', occurredAt: t(9, 30) }),
			entry({ authorId: 'tech', kind: 'measure', occurredAt: t(11, 0) }), // 90-min gap left out
			entry({ authorId: 'tech', kind: 'note', occurredAt: t(11, 15) }),
			entry({ authorId: 'tech2', kind: 'inspection', occurredAt: t(12, 0) }),
			entry({ authorId: 'tech2', kind: 'inspection', occurredAt: t(12, 12) }),
			entry({ authorId: 'tech2', kind: 'accept', occurredAt: t(12, 40) })
		];
		const lines = buildDraftLines({ ...base, entries, labourMode: 'clock' });
		// Rin: 30 + 15 = 45 min = 0.75 h; Ola: 12 min = 0.2 h (the accept is a decision, not work).
		expect(lines.map((l) => [l.description, l.quantity])).toEqual([
			['Labour, clock time: Rin', 0.75],
			['Labour, clock time: Ola', 0.2]
		]);
	});

	it('treats a retracted entry as never made', () => {
		const a = entry({});
		const r = entry({ kind: 'retraction', retracts: a.id });
		const b = entry({});
		expect(liveEntries([a, r, b]).map((e) => e.id)).toEqual([b.id]);
	});

	describe('fluids by the grade that was logged', () => {
		// Invented demo price list with grades; "SAE 10W-30, API SJ, JASO MA" is a valid
		// J300/API/JASO triple (SAE J300, API, JASO T 903; the combination is common practice).
		const graded: PriceListPart[] = [
			...parts,
			{
				id: 'oil-1030',
				code: 'OIL-1030',
				description: 'Engine oil (bulk)',
				unit: 'L',
				priceMinor: 1290,
				active: true,
				fluid: 'SAE 10W-30 · API SJ · JASO MA'
			},
			{
				id: 'oil-1040',
				code: 'OIL-1040-MA2',
				description: 'Engine oil (bulk)',
				unit: 'L',
				priceMinor: 1690,
				active: true,
				fluid: 'SAE 10W-40 · API SN · JASO MA2'
			}
		];

		it('bills the item of the logged grade, and its line names the grade', () => {
			const oil = entry({
				jobStepId: 's-oil',
				value: 1.2,
				unit: 'L',
				fluid: 'SAE 10W-40 · JASO MA2'
			});
			const lines = buildDraftLines({
				...base,
				parts: graded,
				entries: [oil],
				labourMode: 'flat_rate'
			});
			expect(lines[0]).toMatchObject({
				kind: 'fluid',
				partId: 'oil-1040',
				quantity: 1.2,
				unitPriceMinor: 1690,
				unmatched: false,
				description: 'Engine oil (bulk) (OIL-1040-MA2) · SAE 10W-40 · JASO MA2'
			});
		});

		it('says so when no item has the logged grade, instead of billing another', () => {
			// JASO T 903: MB is a different oil from MA2; nothing on the list is MB
			const oil = entry({
				jobStepId: 's-oil',
				value: 1.2,
				unit: 'L',
				fluid: 'SAE 10W-40 · JASO MB'
			});
			const lines = buildDraftLines({
				...base,
				parts: graded,
				entries: [oil],
				labourMode: 'flat_rate'
			});
			expect(lines[0]).toMatchObject({
				kind: 'fluid',
				partId: null,
				unmatched: true,
				unitPriceMinor: 0,
				quantity: 1.2,
				suggestions: ['oil-1040']
			});
			expect(lines[0]?.description).toMatch(/Oil fill, SAE 10W-40 · JASO MB: No price-list fluid/);
		});

		it('a fill with no grade logged bills the step’s own item as before', () => {
			const oil = entry({ jobStepId: 's-oil', value: 1.1, unit: 'L' });
			const lines = buildDraftLines({
				...base,
				parts: graded,
				entries: [oil],
				labourMode: 'flat_rate'
			});
			expect(lines[0]).toMatchObject({ partId: 'oil', quantity: 1.1, unmatched: false });
		});
	});
});
