import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	MAX_PHRASE_CHARS,
	createPhraseParser,
	formatSpec,
	isCancel,
	judge,
	parsePhrase,
	readBack,
	verdictWords,
	type ParsedPhrase,
	type StepSpec
} from './index';

// The issue's example vocabulary (invented values).
const ISSUE_STEPS: StepSpec[] = [
	{ id: 'a', label: 'Swingarm pivot nut', unit: 'N.m', min: 80, max: 90 },
	{ id: 'b', label: 'Fork oil', aliases: ['fork fluid'], unit: 'mL', min: 115, max: 125 },
	{ id: 'c', label: 'Brake pedal free play', unit: 'mm', min: 20, max: 30 }
];

// A fuller invented job: a minor service on an invented single-cylinder scooter.
const JOB: StepSpec[] = [
	{ id: 'fa', label: 'Front axle nut', unit: 'N.m', min: 60, max: 70, done: true },
	{ id: 'ra', label: 'Rear axle nut', unit: 'kgf.m', nominal: 5.4 },
	{ id: 'cs', label: 'Chain slack', unit: 'mm', min: 25, max: 35 },
	{ id: 'ca', label: 'Chain adjuster locknut', unit: 'N.m', min: 20, max: 24 },
	{ id: 'v1', label: 'Cylinder 1 intake valve clearance', unit: 'mm', min: 0.1, max: 0.15 },
	{ id: 'v2', label: 'Cylinder 2 intake valve clearance', unit: 'mm', min: 0.1, max: 0.15 },
	{ id: 'eo', label: 'Engine oil', aliases: ['oil'], unit: 'L', min: 0.95, max: 1.05 },
	{ id: 'dp', label: 'Drain plug washer', aliases: ['sump washer'] },
	{ id: 'tr', label: 'Test ride' },
	{ id: 'is', label: 'Idle speed', unit: '/min', nominal: 1400 },
	{ id: 'tp', label: 'Front tyre pressure', unit: 'kPa', min: 200, max: 225 },
	{ id: 'bv', label: 'Battery voltage', unit: 'V', min: 12.4 },
	{ id: 'pw', label: 'Brake pad thickness', unit: 'mm', min: 1.5 },
	{ id: 'ct', label: 'Coolant temperature fan on', unit: 'Cel', min: 98, max: 102 },
	{ id: 'gp', label: 'Spark plug gap', unit: 'mm' },
	{ id: 'nu', label: 'Headlight aim' }
];

const NOW = new Date('2026-12-02T09:00:00Z'); // 10:00 in Europe/Berlin
const ctx = { steps: JOB, now: NOW, timeZone: 'Europe/Berlin' };
const p = (text: string): ParsedPhrase => parsePhrase(text, ctx);

describe('the spec phrasings a workshop writes', () => {
	const c = { steps: ISSUE_STEPS, now: NOW, timeZone: 'UTC' };

	it('"swingarm pivot 8.5 kgf m" → measure a, 8.5 kgf.m = 83.356525 N.m, in', () => {
		const r = parsePhrase('swingarm pivot 8.5 kgf m', c);
		expect(r.intent).toBe('measure');
		expect(r.stepId).toBe('a');
		expect(r.quantity).toEqual({ value: 8.5, unit: 'kgf.m' });
		// 8.5 × 9.80665 (NIST SP 811 App. B.8, kgf = 9.80665 N), exact
		expect(r.specValue).toEqual({ value: 83.356525, unit: 'N.m' });
		expect(r.verdict).toBe('in');
		expect(r.problems).toEqual([]);
	});

	it('"fork oil 4.5 fl oz" → measure b, 133.08 mL, high', () => {
		const r = parsePhrase('fork oil 4.5 fl oz', c);
		expect(r.intent).toBe('measure');
		expect(r.stepId).toBe('b');
		expect(r.quantity).toEqual({ value: 4.5, unit: '[foz_us]' });
		// US fl oz = 231 in³ / 128 = 29.5735295625 mL (NIST SP 811 App. B.8 gallon definition)
		expect(r.specValue?.unit).toBe('mL');
		expect(r.specValue?.value).toBeCloseTo(133.08, 2);
		expect(r.verdict).toBe('high');
	});

	it('"brake pedal play thirty five" → measure c, 35 mm (step unit), high', () => {
		const r = parsePhrase('brake pedal play thirty five', c);
		expect(r.intent).toBe('measure');
		expect(r.stepId).toBe('c');
		expect(r.quantity).toEqual({ value: 35, unit: 'mm' });
		expect(r.unitAssumed).toBe(true);
		expect(r.verdict).toBe('high');
	});

	it('"spec fork fluid" → spec b, nothing to log', () => {
		const r = parsePhrase('spec fork fluid', c);
		expect(r.intent).toBe('spec');
		expect(r.stepId).toBe('b');
		expect(r.quantity).toBeNull();
		expect(r.verdict).toBeNull();
	});
});

describe('check values from the trade', () => {
	it('53 N·m against a 5.4 kgf·m nominal with ±10 % is in', () => {
		// common practice: ±10 % house tolerance on a nominal-only torque (no single published source);
		// 5.4 kgf·m = 52.95591 N·m (9.80665 from NIST SP 811 App. B.8)
		const r = p('rear axle nut 53 Nm');
		expect(r.stepId).toBe('ra');
		expect(r.verdict).toBe('in');
		expect(r.specValue?.unit).toBe('kgf.m');
		expect(r.specValue?.value).toBeCloseTo(53 / 9.80665, 12);
		expect(r.band).toEqual({ min: 4.86, max: 5.94, source: 'shop_tolerance' });
	});

	it('judges a nominal-only spec with the tolerance the caller passes', () => {
		const step = { label: 'Rear axle nut', unit: 'kgf.m', nominal: 5.4 };
		// 5.4 kgf·m ± 2 % = 51.90 … 54.01 N·m; 53 N·m is in, 50 N·m is low
		expect(judge(53, 'N.m', step, 2).verdict).toBe('in');
		expect(judge(50, 'N.m', step, 2).verdict).toBe('low');
		expect(judge(60, 'N.m', step).verdict).toBe('high');
		const r = parsePhrase('rear axle nut 50 Nm', { ...ctx, tolerancePct: 2 });
		expect(r.verdict).toBe('low');
	});

	it('is inclusive and float-safe at the bounds', () => {
		// 950 mL = 0.95 L exactly at the lower bound (SP 811 App. B.8: L = 0.001 m³)
		expect(p('oil 950 ml').verdict).toBe('in');
		expect(p('oil 1050 ml').verdict).toBe('in');
		expect(p('oil 1.05 l').verdict).toBe('in');
		expect(p('oil 949 ml').verdict).toBe('low');
		expect(p('oil 1051 ml').verdict).toBe('high');
		// 0.1 + 0.05 style float error must not push a bound value out
		expect(judge(0.1 + 0.05, 'mm', { label: 'x', unit: 'mm', min: 0.1, max: 0.15 }).verdict).toBe(
			'in'
		);
		// 2.25 bar = 225 kPa exactly at the upper bound (SP 811 App. B.8: bar = 100 kPa)
		expect(p('front tyre pressure 2,25 bar').verdict).toBe('in');
	});

	it('converts tyre pressure in psi', () => {
		// 32 psi = 220.632 kPa (psi = 6.894757 kPa, NIST SP 811 App. B.8)
		const r = p('front tyre 32 psi');
		expect(r.stepId).toBe('tp');
		expect(r.specValue?.value).toBeCloseTo(220.632, 3);
		expect(r.verdict).toBe('in');
	});
});

describe('verdicts', () => {
	it('one-sided limits', () => {
		expect(p('battery voltage 12.6 V').verdict).toBe('in');
		expect(p('battery voltage 12.1 volts').verdict).toBe('low');
		expect(p('brake pad thickness 1.2 mm').verdict).toBe('low');
		expect(p('brake pad thickness 4 mm').verdict).toBe('in');
	});

	it('no_spec without limits, without a nominal, or without a step unit', () => {
		const gap = p('spark plug gap 0.8 mm');
		expect(gap.stepId).toBe('gp');
		expect(gap.verdict).toBe('no_spec');
		expect(gap.specValue).toEqual({ value: 0.8, unit: 'mm' });
		const aim = p('headlight aim 3');
		expect(aim.stepId).toBe('nu');
		expect(aim.verdict).toBe('no_spec');
		expect(aim.quantity).toEqual({ value: 3, unit: '1' });
	});

	it('converts temperatures with offsets', () => {
		// 212 °F = 100 °C (Celsius–Fahrenheit definition, NIST SP 811 §4.2.1.1 [MEM])
		const r = p('coolant temperature fan on 212 °F');
		expect(r.stepId).toBe('ct');
		expect(r.specValue).toEqual({ value: 100, unit: 'Cel' });
		expect(r.verdict).toBe('in');
	});

	it('"degrees" alone is the temperature step’s own scale', () => {
		const r = p('coolant temperature fan on 100 degrees');
		expect(r.stepId).toBe('ct');
		expect(r.quantity).toEqual({ value: 100, unit: 'Cel' });
		expect(r.unitAssumed).toBe(true);
		expect(r.verdict).toBe('in');
		const f = parsePhrase('oil temp 200 degrees', {
			steps: [{ id: 'ot', label: 'Oil temperature', unit: '[degF]', min: 180, max: 220 }]
		});
		expect(f.quantity).toEqual({ value: 200, unit: '[degF]' });
		expect(f.verdict).toBe('in');
		const none = p('chain slack 90 degrees');
		expect(none.verdict).toBeNull();
		expect(none.problems.join(' ')).toMatch(/"Degrees" alone is not a unit here/);
	});

	it('nominal-only rpm with the default ±10 %', () => {
		expect(p('idle speed 1500 rpm').verdict).toBe('in');
		expect(p('idle 1600 rpm').verdict).toBe('high');
		expect(p('idle fourteen hundred').quantity).toEqual({ value: 1400, unit: '/min' });
	});

	it('reports an unusable tolerance and falls back to the shop default', () => {
		const r = parsePhrase('rear axle nut 53 Nm', { ...ctx, tolerancePct: -5 });
		expect(r.verdict).toBe('in');
		expect(r.problems.join(' ')).toMatch(/Tolerance -5 % is not usable/);
	});
});

describe('units decide between steps', () => {
	it('a torque never lands on a length step with a similar name', () => {
		const torque = p('chain 22 nm');
		expect(torque.stepId).toBe('ca');
		const length = p('chain 30 mm');
		expect(length.stepId).toBe('cs');
		expect(length.verdict).toBe('in');
	});

	it('a unit of another kind on a clearly named step: problem, no verdict', () => {
		const r = parsePhrase('fork oil 80 nm', { steps: ISSUE_STEPS });
		expect(r.stepId).toBe('b');
		expect(r.verdict).toBeNull();
		expect(r.specValue).toBeNull();
		expect(r.problems).toEqual(['Fork oil is measured in mL (volume); 80 N·m is a torque.']);
	});

	it('judge() says the same for a unit of another kind', () => {
		const j = judge(80, 'N.m', ISSUE_STEPS[1] as StepSpec);
		expect(j.verdict).toBeNull();
		expect(j.problems[0]).toMatch(/volume.*torque/);
	});
});

describe('step matching', () => {
	it('tolerates misspellings and word order', () => {
		expect(p('front axel nut 64nm').stepId).toBe('fa');
		expect(p('nut front axle 64 nm').stepId).toBe('fa');
		expect(parsePhrase('swingarm pivit 85', { steps: ISSUE_STEPS }).stepId).toBe('a');
		expect(parsePhrase('swing arm pivot 85 nm', { steps: ISSUE_STEPS }).stepId).toBe('a');
		expect(p('cyl 1 intake valve 0.14 mm').stepId).toBe('v1');
	});

	it('ignores filler words', () => {
		const r = p('torqued the front axle nut to 65 nm');
		expect(r.stepId).toBe('fa');
		expect(r.verdict).toBe('in');
		expect(p('check the chain slack at 30 mm').stepId).toBe('cs');
		expect(p('fill engine oil 1 l').stepId).toBe('eo');
	});

	it('keeps cylinder numbers and sides apart', () => {
		expect(p('cylinder two intake valve clearance zero point one two').stepId).toBe('v2');
		expect(p('cylinder 1 intake valve clearance 0.12').stepId).toBe('v1');
		// no rear tyre step: "rear" contradicts "front", so nothing matches
		const rear = p('rear tyre 32 psi');
		expect(rear.stepId).toBeNull();
		expect(rear.problems[0]).toMatch(/No step of this job matches "rear tyre"/);
	});

	it('asks when two steps fit equally', () => {
		const r = p('axle nut 65 nm');
		expect(r.stepId).toBeNull();
		expect(r.candidates.map((x) => x.stepId).sort()).toEqual(['fa', 'ra']);
		expect(r.problems[0]).toMatch(/fits more than one step: .*Front axle nut.*Rear axle nut/);
	});

	it('lists candidates best first with scores in 0..1', () => {
		const r = p('chain 30');
		expect(r.candidates.length).toBeGreaterThan(1);
		for (let i = 1; i < r.candidates.length; i++) {
			expect(r.candidates[i - 1]!.score).toBeGreaterThanOrEqual(r.candidates[i]!.score);
		}
		for (const c of r.candidates) {
			expect(c.score).toBeGreaterThan(0);
			expect(c.score).toBeLessThanOrEqual(1);
		}
	});

	it('finds the named step among thousands of look-alikes', () => {
		const sides = ['front', 'rear', 'left', 'right', 'upper', 'lower'];
		const places = ['brake disc', 'caliper', 'footrest', 'engine mount', 'wheel hub', 'fork'];
		const things = ['bolt', 'nut', 'free play', 'clearance', 'screw'];
		const many: StepSpec[] = [];
		for (let i = 0; i < 3000; i++) {
			const side = sides[i % 6] as string;
			const place = places[Math.floor(i / 6) % 6] as string;
			const thing = things[Math.floor(i / 36) % 5] as string;
			many.push({
				id: `s${i}`,
				label: `${side} ${place} ${thing} ${i}`,
				unit: 'mm',
				min: 1,
				max: 2
			});
		}
		many.push({ id: 'target', label: 'Brake pedal free play', unit: 'mm', min: 20, max: 30 });
		const parser = createPhraseParser(many);
		const r = parser.parse('brake pedal free play 25 mm');
		expect(r.stepId).toBe('target');
		expect(r.verdict).toBe('in');
		expect(parser.parse('spec brake pedal free play').stepId).toBe('target');
		const label = many[1234]?.label ?? '';
		expect(label).toBe('upper caliper screw 1234');
		expect(parser.parse(`${label} 1.5`).stepId).toBe('s1234');
		expect(parser.parse('upper caliper screw 1235 1.5').stepId).toBeNull();
	});

	it('builds the index once per vocabulary and reuses it', () => {
		const parser = createPhraseParser(JOB);
		const a = parser.parse('oil 1 l', { now: NOW, timeZone: 'UTC' });
		expect(a.stepId).toBe('eo');
		expect(a.verdict).toBe('in');
		// a new array is a new vocabulary: the relabelled step matches there, not in the old one
		const copy = JOB.map((s) => (s.id === 'tr' ? { ...s, label: 'Road test' } : s));
		expect(parsePhrase('done road test', { steps: copy }).stepId).toBe('tr');
		expect(parsePhrase('done road test', { steps: JOB }).stepId).toBeNull();
		expect(parser.parse('done road test').stepId).toBeNull();
	});
});

describe('numbers', () => {
	it('digits, decimal comma, attached units, words', () => {
		expect(p('oil 1.1 L filled').quantity).toEqual({ value: 1.1, unit: 'L' });
		expect(p('oil 0,85 l').quantity).toEqual({ value: 0.85, unit: 'L' });
		expect(p('oil 1.1l').quantity).toEqual({ value: 1.1, unit: 'L' });
		expect(p('oil one point one litres').quantity).toEqual({ value: 1.1, unit: 'L' });
		expect(p('oil one and a half litres').quantity).toEqual({ value: 1.5, unit: 'L' });
		expect(p('chain slack twenty four point five').quantity).toEqual({ value: 24.5, unit: 'mm' });
		expect(p('cylinder 1 intake valve clearance zero point one').quantity).toEqual({
			value: 0.1,
			unit: 'mm'
		});
		expect(p('idle speed a hundred and ten').quantity?.value).toBe(110);
		expect(p('cylinder 2 intake valve clearance two point three five').quantity?.value).toBe(2.35);
	});

	it('says so when the word after the number is not a unit', () => {
		const r = p('front axle nut 65 zorks');
		expect(r.quantity).toBeNull();
		expect(r.verdict).toBeNull();
		expect(r.problems[0]).toMatch(/"zorks" is not a unit Benchcall knows/);
	});

	it('a number followed by more of a name is part of the name, not a value', () => {
		const r = p('cylinder 2 intake valve clearance');
		expect(r.intent).toBe('unknown');
		expect(r.quantity).toBeNull();
		expect(r.candidates[0]?.stepId).toBe('v2');
		expect(r.problems[0]).toMatch(/No value heard for Cylinder 2 intake valve clearance/);
		const done = p('done cylinder 2 intake valve clearance 0.12 mm');
		expect(done.intent).toBe('measure');
		expect(done.stepId).toBe('v2');
		expect(done.quantity?.value).toBe(0.12);
	});

	it('reads "1.1 in the sump" as no inch', () => {
		expect(p('engine oil 1.1 in the sump').quantity).toEqual({ value: 1.1, unit: 'L' });
	});
});

describe('intents', () => {
	it('next → first step not done, in order', () => {
		expect(p('next').intent).toBe('next');
		expect(p('next').stepId).toBe('ra');
		expect(p("what's next").stepId).toBe('ra');
		const all = JOB.map((s) => ({ ...s, done: true }));
		const r = parsePhrase('next step', { steps: all });
		expect(r.stepId).toBeNull();
		expect(r.problems).toEqual(['Every step is done.']);
	});

	it('spec forms', () => {
		for (const t of [
			'spec chain slack',
			"what's the spec for chain slack",
			'what is the spec for the chain slack',
			'chain slack spec',
			'spec for chain slack'
		]) {
			const r = p(t);
			expect(r.intent, t).toBe('spec');
			expect(r.stepId, t).toBe('cs');
		}
		expect(p('spec').problems).toEqual(['Which step? e.g. "spec rear axle".']);
	});

	it('parts: new / replaced / renewed, with the step they name', () => {
		const a = p('new drain plug washer');
		expect(a.intent).toBe('part');
		expect(a.stepId).toBe('dp');
		expect(a.note).toBe('drain plug washer');
		expect(p('replaced sump washer').stepId).toBe('dp');
		expect(p('renewed drain plug washer').stepId).toBe('dp');
		expect(p('drain plug washer replaced').intent).toBe('part');
		const other = p('new air filter');
		expect(other.intent).toBe('part');
		expect(other.stepId).toBeNull();
		expect(other.note).toBe('air filter');
		expect(other.problems).toEqual([]);
	});

	it('note keeps the technician’s words', () => {
		const r = p('note Left fork seal weeping, customer told');
		expect(r.intent).toBe('note');
		expect(r.note).toBe('Left fork seal weeping, customer told');
		expect(p('Note: chain worn').note).toBe('chain worn');
		expect(p('note').problems[0]).toMatch(/Say what to note/);
	});

	it('done with a step, without a value', () => {
		const r = p('done test ride');
		expect(r.intent).toBe('done');
		expect(r.stepId).toBe('tr');
		expect(r.quantity).toBeNull();
		expect(p('test ride ok').stepId).toBe('tr');
		expect(p('headlight aim checked').intent).toBe('done');
		// a number in the step's name is not a value
		const cyl = p('done cylinder 2 intake valve clearance');
		expect(cyl.intent).toBe('done');
		expect(cyl.stepId).toBe('v2');
	});

	it('undo', () => {
		expect(p('undo').intent).toBe('undo');
		expect(p('Undo last entry').intent).toBe('undo');
	});

	it('cancel is a separate helper, not an entry', () => {
		expect(isCancel('cancel')).toBe(true);
		expect(isCancel('Cancel that.')).toBe(true);
		expect(isCancel('never mind')).toBe(true);
		expect(isCancel('cancel the rear axle')).toBe(false);
		expect(isCancel('rear axle 80 nm')).toBe(false);
		expect(p('cancel').intent).toBe('unknown');
	});

	it('empty or gibberish → unknown with a helpful problem', () => {
		const e = p('   ');
		expect(e.intent).toBe('unknown');
		expect(e.problems[0]).toMatch(/Nothing heard/);
		const g = p('blorp snark');
		expect(g.intent).toBe('unknown');
		expect(g.problems[0]).toMatch(/could not match "blorp snark" to a step.*"note"/);
	});

	it('a step without a value asks for one', () => {
		const r = p('chain slack');
		expect(r.intent).toBe('unknown');
		expect(r.candidates[0]?.stepId).toBe('cs');
		expect(r.problems[0]).toMatch(/No value heard for Chain slack/);
	});
});

describe('times', () => {
	it('"at 08:30" in the shop time zone', () => {
		const r = p('front axle nut 65 nm at 08:30');
		expect(r.stepId).toBe('fa');
		expect(r.occurredAt).toBe('2026-12-02T07:30:00.000Z');
		expect(r.quantity?.value).toBe(65);
	});

	it('"5 minutes ago" and spoken forms', () => {
		expect(p('front axle nut 65 nm 5 minutes ago').occurredAt).toBe('2026-12-02T08:55:00.000Z');
		expect(p('oil 1 l twenty minutes ago').occurredAt).toBe('2026-12-02T08:40:00.000Z');
		expect(p('done test ride half an hour ago').occurredAt).toBe('2026-12-02T08:30:00.000Z');
		expect(p('new drain plug washer an hour ago').occurredAt).toBe('2026-12-02T08:00:00.000Z');
	});

	it('a clock time later than now is yesterday, or a problem when just ahead', () => {
		expect(p('chain slack 30 mm at 23:15').occurredAt).toBe('2026-12-01T22:15:00.000Z');
		const ahead = p('chain slack 30 mm at 10:30');
		expect(ahead.occurredAt).toBeNull();
		expect(ahead.problems[0]).toMatch(/later than now/);
	});

	it('"at 80" is a value, not a time', () => {
		const r = p('front axle nut torqued at 65 nm');
		expect(r.occurredAt).toBeNull();
		expect(r.quantity?.value).toBe(65);
	});

	it('an unknown time zone is a problem, not a crash', () => {
		const r = parsePhrase('chain slack 30 mm at 08:00', { ...ctx, timeZone: 'Nowhere/Bay' });
		expect(r.occurredAt).toBe('2026-12-02T08:00:00.000Z');
		expect(r.problems[0]).toMatch(/Unknown time zone 'Nowhere\/Bay'/);
	});
});

describe('words for the screen and the read-back', () => {
	it('formats a spec', () => {
		expect(formatSpec({ unit: 'N.m', min: 80, max: 90 })).toBe('80–90 N·m');
		expect(formatSpec({ unit: 'N.m', min: 80, max: 90 }, { spoken: true })).toBe(
			'80 to 90 newton metres'
		);
		expect(formatSpec({ unit: 'V', min: 12.4 })).toBe('at least 12.4 V');
		expect(formatSpec({ unit: 'mm', max: 1.5 })).toBe('at most 1.5 mm');
		expect(formatSpec({ unit: 'kgf.m', nominal: 5.4 })).toBe('5.4 kgf·m');
		expect(formatSpec({})).toBe('no spec');
	});

	it('reads back what was understood, in Benchcall words', () => {
		const c = { steps: ISSUE_STEPS };
		const say = (t: string) => readBack(parsePhrase(t, c), ISSUE_STEPS);
		expect(say('swingarm pivot 85 newton metres')).toBe(
			'Swingarm pivot nut, 85 newton metres, in spec'
		);
		expect(say('fork oil 4.5 fl oz')).toBe('Fork oil, 4.5 US fluid ounces, over');
		expect(say('brake pedal play 12')).toBe('Brake pedal free play, 12 millimetres, under');
		expect(say('spec fork fluid')).toBe('Fork oil: spec 115 to 125 millilitres');
		expect(say('new fork seal')).toBe('New fork seal');
		expect(say('next')).toBe('Next: Swingarm pivot nut');
		expect(say('fork oil 80 nm')).toBe('Fork oil is measured in mL (volume); 80 N·m is a torque.');
		expect(verdictWords('no_spec')).toBe('no spec');
	});
});

describe('robustness', () => {
	const FLUID_STEPS: StepSpec[] = [
		{ id: 'oil', label: 'Engine oil', unit: 'L', min: 1, max: 1.2, fluid: 'SAE 10W-40, JASO MA2' },
		{ id: 'brake', label: 'Brake fluid', unit: 'mL', nominal: 90, fluid: 'DOT 4' }
	];
	const isResult = (r: ParsedPhrase) => {
		expect(
			r.fluidVerdict === null || ['meets', 'fails', 'not_stated'].includes(r.fluidVerdict)
		).toBe(true);
		expect(['measure', 'part', 'note', 'next', 'spec', 'done', 'undo', 'unknown']).toContain(
			r.intent
		);
		expect(Array.isArray(r.problems)).toBe(true);
		expect(Array.isArray(r.candidates)).toBe(true);
	};

	it('never throws for any string (fast-check, incl. odd Unicode)', () => {
		fc.assert(
			fc.property(fc.string({ unit: 'binary', maxLength: 200 }), (s) => {
				isResult(p(s));
			}),
			{ numRuns: 400 }
		);
		fc.assert(
			fc.property(fc.string({ unit: 'grapheme', maxLength: 80 }), (s) => {
				isResult(p(s));
			}),
			{ numRuns: 300 }
		);
	}, 30_000); // 700 generated phrases: seconds on a busy shared machine, not a timing check

	it('never throws on phrase-like mixtures of words, numbers and units', () => {
		const words = fc.constantFrom(
			'front',
			'rear',
			'axle',
			'nut',
			'oil',
			'at',
			'point',
			'twenty',
			'hundred',
			'and',
			'a',
			'minus',
			'80',
			'1,5',
			'.5',
			'-',
			'nm',
			'kgf',
			'm',
			'in',
			'ago',
			'minutes',
			'10:30',
			// the adapter's words (phrase/adapter.ts)
			'adapter',
			'crowfoot',
			'back',
			'90',
			'degrees',
			'mm',
			'spec',
			'new',
			'done',
			'note',
			'°c',
			'⁻¹',
			'½',
			'\u0000',
			'𝟖𝟎',
			// fluid grades (SAE J300, API, JASO T 903)
			'10w-30',
			'15w-35',
			'sae',
			'w',
			'ten',
			'thirty',
			'api',
			's',
			'sn',
			'plus',
			'jaso',
			'ma',
			'two',
			'mb',
			'dot',
			'5.1',
			'six'
		);
		fc.assert(
			fc.property(fc.array(words, { maxLength: 30 }), (ws) => {
				isResult(p(ws.join(' ')));
				isResult(parsePhrase(ws.join(' '), { steps: FLUID_STEPS, timeZone: 'UTC' }));
			}),
			{ numRuns: 500 }
		);
	});

	it('never throws on 10 kB inputs, and reads only the first part', () => {
		fc.assert(
			fc.property(fc.string({ unit: 'binary', minLength: 10_000, maxLength: 10_240 }), (s) => {
				isResult(p(s));
			}),
			{ numRuns: 10 }
		);
		const long = 'front axle nut 65 nm ' + 'x'.repeat(10_240);
		const r = p(long);
		expect(r.problems).toContain(`Only the first ${MAX_PHRASE_CHARS} characters were read.`);
	});

	it('survives bad contexts', () => {
		const bad = [
			{ steps: null },
			{ steps: [null, 5, { id: 'x' }] },
			{ steps: JOB, now: new Date('nope') },
			{ steps: JOB, tolerancePct: Number.NaN }
		] as unknown as Parameters<typeof parsePhrase>[1][];
		for (const c of bad) isResult(parsePhrase('front axle nut 65 nm', c));
		// a step without an id is left out rather than matched under a made-up id
		const noId = parsePhrase('front axle nut 65 nm', {
			steps: [{ label: 'Front axle nut', unit: 'N.m' } as unknown as StepSpec]
		});
		expect(noId.stepId).toBeNull();
		isResult(parsePhrase(undefined as unknown as string, ctx));
		expect(parsePhrase('x 1', { steps: [] }).problems).toEqual(['This job has no steps to match.']);
	});
});
