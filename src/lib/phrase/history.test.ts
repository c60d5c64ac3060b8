import { describe, expect, it } from 'vitest';
import { historyWords } from './history';
import { parsePhrase, readBack, type StepSpec } from './index';

// An invented job (demo values).
const STEPS: StepSpec[] = [
	{ id: 'ra', label: 'Rear axle nut', unit: 'N.m', min: 80, max: 96 },
	{ id: 'cs', label: 'Chain slack', unit: 'mm', min: 25, max: 35 },
	{ id: 'sh', label: 'Service history stamp' },
	{ id: 'tr', label: 'Test ride' }
];
const p = (text: string) =>
	parsePhrase(text, { steps: STEPS, now: new Date('2026-12-04T09:00:00Z'), timeZone: 'UTC' });

describe('"history <step words>"', () => {
	it('names the step in every form, and logs nothing', () => {
		for (const [text, step] of [
			['history rear axle', 'ra'],
			['History rear axle nut', 'ra'],
			['rear axle history', 'ra'],
			['history of the chain slack', 'cs'],
			['show the history of chain slack', 'cs'],
			['past readings for chain slack', 'cs'],
			['what was it last time for the rear axle', 'ra'],
			['chain slack last time', 'cs']
		] as const) {
			const r = p(text);
			expect(r.intent, text).toBe('history');
			expect(r.stepId, text).toBe(step);
			expect(r.quantity, text).toBeNull();
			expect(r.verdict, text).toBeNull();
			expect(r.occurredAt, text).toBeNull();
		}
	});

	it('asks which step when none is named or none matches', () => {
		expect(p('history')).toMatchObject({
			intent: 'history',
			stepId: null,
			problems: ['Which step? e.g. "history rear axle".']
		});
		const r = p('history flux capacitor');
		expect(r.intent).toBe('history');
		expect(r.stepId).toBeNull();
		expect(r.problems[0]).toMatch(/No step of this job matches/);
	});

	it('never takes a value, a part or a step done for a history question', () => {
		// a value in the phrase is a measurement, whatever words follow it
		expect(p('chain slack 30 mm last time')).toMatchObject({ intent: 'measure', stepId: 'cs' });
		expect(p('rear axle 88 nm')).toMatchObject({ intent: 'measure', stepId: 'ra' });
		// a step whose name holds the word
		expect(p('done service history stamp')).toMatchObject({ intent: 'done', stepId: 'sh' });
		expect(p('service history stamp done')).toMatchObject({ intent: 'done', stepId: 'sh' });
		expect(p('spec rear axle').intent).toBe('spec');
	});

	it('reads back what it will show', () => {
		expect(readBack(p('history rear axle'), STEPS)).toBe(
			'Rear axle nut: past readings on this vehicle'
		);
		expect(readBack(p('history'), STEPS)).toBe('Which step? e.g. "history rear axle".');
	});

	it('finds the step words between the question words', () => {
		expect(historyWords(['history', 'rear', 'axle'])).toEqual(['rear', 'axle']);
		expect(historyWords(['rear', 'axle', 'history'])).toEqual(['rear', 'axle']);
		expect(historyWords(['history'])).toEqual([]);
		expect(historyWords(['rear', 'axle', '80'])).toBeNull();
		// "history" alone at the end names no step: not a suffix question
		expect(historyWords(['last', 'time'])).toBeNull();
	});
});
