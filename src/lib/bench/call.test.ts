import { describe, expect, it } from 'vitest';
import { parsePhrase } from '../phrase/index';
import {
	blocker,
	previewRows,
	procedureProgress,
	specText,
	spokenResult,
	toStepSpecs
} from './call';
import type { BenchStep } from './types';

function step(over: Partial<BenchStep> & Pick<BenchStep, 'id' | 'label'>): BenchStep {
	return {
		position: 0,
		procedureId: 'p1',
		procedureName: 'Engine removal and refit (demo specs)',
		aliases: [],
		unit: 'N.m',
		nominal: null,
		min: null,
		max: null,
		caution: null,
		fluid: null,
		adapterLengthMm: null,
		adapterDirection: null,
		done: false,
		lastVerdict: null,
		...over
	};
}

// invented demo values
const steps = [
	step({ id: 'front', label: 'Front axle nut', min: 55, max: 65 }),
	step({ id: 'rear', label: 'Rear axle nut', min: 50, max: 56, done: true }),
	step({ id: 'upper', label: 'Upper engine mount bolt', unit: 'kgf.m', nominal: 5 }),
	step({
		id: 'ride',
		label: 'Test ride',
		unit: null,
		procedureId: 'p2',
		procedureName: 'Road test'
	})
];
const byId = new Map(steps.map((s) => [s.id, s]));
const specs = toStepSpecs(steps);

describe('the call bar’s readings', () => {
	it('converts kgf·m into the spec’s N·m and judges it', () => {
		const text = 'rear axle nut 5.4 kgf m';
		const [top] = previewRows(text, parsePhrase(text, { steps: specs }), byId, specs, 10);
		// 5.4 kgf·m = 52.95591 N·m, exact via g_n = 9.80665 m/s² (common practice; NIST SP 811 B.8)
		expect(top.step?.id).toBe('rear');
		expect(top.parsed.specValue?.value).toBeCloseTo(52.95591, 5);
		expect(top.parsed.verdict).toBe('in');
		expect(blocker(top)).toBeNull();
		expect(spokenResult(top)).toMatch(/^Rear axle nut, 5\.4 .+, in spec$/);
	});

	it('offers other steps the phrase could mean, judged against each', () => {
		const text = 'axle nut 60 nm';
		const rows = previewRows(text, parsePhrase(text, { steps: specs }), byId, specs, 10);
		expect(rows.length).toBeGreaterThan(1);
		expect(rows[0].picked).toBe(false);
		const other = rows.slice(1);
		expect(other.every((r) => r.picked && r.key === r.step?.id)).toBe(true);
		const verdicts = Object.fromEntries(rows.map((r) => [r.step?.id, r.parsed.verdict]));
		// 60 N·m: inside 55–65, above 50–56
		expect(verdicts).toMatchObject({ front: 'in', rear: 'high' });
	});

	it('reads "job 1042" as opening a job, not as a step', () => {
		const text = 'job 1042';
		expect(previewRows(text, parsePhrase(text, { steps: specs }), byId, specs, 10)).toEqual([]);
	});

	it('says why a reading cannot be logged', () => {
		const text = 'front axle nut';
		const [top] = previewRows(text, parsePhrase(text, { steps: specs }), byId, specs, 10);
		expect(blocker(top)).toMatch(/\S/);
		const unread = parsePhrase('qwxz', { steps: specs });
		expect(blocker({ key: 'top', parsed: unread, step: null, picked: false })).toMatch(/\S/);
	});
});

describe('specText', () => {
	it('writes each kind of band', () => {
		expect(specText(steps[0], 10)).toBe('55 N·m – 65 N·m');
		expect(specText(steps[2], 10)).toBe('5 kgf·m ± 10 %');
		expect(specText(steps[3], 10)).toBe('check, no value');
		expect(specText({ unit: 'mm', min: 20, max: null, nominal: null }, 10)).toBe('≥ 20 mm');
		expect(specText({ unit: 'mm', min: null, max: null, nominal: null }, 10)).toBe('no spec');
		expect(specText(null, 10)).toBe('');
	});
});

describe('procedureProgress', () => {
	it('counts done steps per procedure, in the job’s order', () => {
		expect(procedureProgress(steps)).toEqual([
			{ id: 'p1', name: 'Engine removal and refit (demo specs)', done: 1, total: 3 },
			{ id: 'p2', name: 'Road test', done: 0, total: 1 }
		]);
	});
});
