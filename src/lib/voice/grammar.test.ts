import { describe, expect, it } from 'vitest';
import { parsePhrase, wordsToNumber } from '../phrase/index';
import { unitFromWords } from '../units/index';
import {
	SPOKEN_UNITS,
	buildGrammar,
	gradeFamilies,
	numberWords,
	pronounce,
	spokenWords,
	stepUnitPhrases
} from './grammar';

// A few entries in the model dictionary's format (ARPAbet phones, as in CMUdict).
const DICT: Record<string, string> = {
	rear: 'R IH R',
	axle: 'AE K S AH L',
	nut: 'N AH T',
	engine: 'EH N JH AH N',
	oil: 'OY L',
	fill: 'F IH L',
	newton: 'N UW T AH N',
	liters: 'L IY T ER Z',
	tick: 'T IH K',
	over: 'OW V ER',
	idle: 'AY D AH L',
	speed: 'S P IY D',
	tire: 'T AY ER',
	front: 'F R AH N T',
	batch: 'B AE CH'
};
const lookup = (w: string) => DICT[w] ?? null;

describe('numberWords', () => {
	it('says whole numbers the way the phrase engine reads them back, 0 to 999', () => {
		expect(numberWords(0)).toBe('zero');
		expect(numberWords(13)).toBe('thirteen');
		expect(numberWords(88)).toBe('eighty eight');
		expect(numberWords(105)).toBe('one hundred and five');
		expect(numberWords(999)).toBe('nine hundred and ninety nine');
		for (let n = 0; n <= 999; n++) expect(wordsToNumber(numberWords(n))).toBe(n);
	});
	it('refuses what the grammar cannot say', () => {
		expect(() => numberWords(1000)).toThrow(RangeError);
		expect(() => numberWords(1.5)).toThrow(RangeError);
	});
});

describe('spoken units', () => {
	it('every spoken unit phrase reads back to its own UCUM code', () => {
		for (const [code, phrases] of Object.entries(SPOKEN_UNITS)) {
			for (const p of phrases) expect(unitFromWords(p), p).toBe(code);
		}
	});
	it('offers a step its own kind of quantity, less the alike-sounding unit of another scale', () => {
		const phrases = stepUnitPhrases({ label: 'Rear axle nut', unit: 'N.m' });
		expect(phrases).toContain('newton metres');
		expect(phrases).toContain('foot pounds');
		expect(phrases).toContain('kilogram metres');
		expect(phrases).not.toContain('newton centimetres');
		expect(phrases).not.toContain('litres');
		expect(phrases).not.toContain('volts');
		const gap = stepUnitPhrases({ label: 'Chain slack', unit: 'mm' });
		expect(gap).toContain('millimetres');
		expect(gap).toContain('inches');
		expect(gap).not.toContain('centimetres');
		// oil is said in litres and in millilitres alike: both stay
		const oil = stepUnitPhrases({ label: 'Oil', unit: 'L' });
		expect(oil).toEqual(expect.arrayContaining(['litres', 'millilitres', 'quarts']));
		expect(stepUnitPhrases({ label: 'Test ride' })).toEqual([]);
		// a job that mixes N·m and kgf·m steps hears neither "newton centimetres" nor "kilogram
		// centimetres" after any of them, unless a step is in that unit itself
		const mixed = ['N.m', 'kgf.m'];
		const nm = stepUnitPhrases({ label: 'Rear axle nut', unit: 'N.m' }, mixed);
		expect(nm).toContain('kilogram metres');
		expect(nm).not.toContain('kilogram centimetres');
		expect(nm).not.toContain('newton centimetres');
		const kgfcm = stepUnitPhrases({ label: 'Plug', unit: 'kgf.m' }, [...mixed, 'N.cm']);
		expect(kgfcm).toContain('newton centimetres');
	});
});

describe('pronounce', () => {
	it('uses the dictionary first', () => {
		expect(pronounce('axle', lookup)).toBe('AE K S AH L');
	});
	it('builds British spellings, plurals and run-together words from known words', () => {
		expect(pronounce('litres', lookup)).toBe('L IY T ER Z');
		expect(pronounce('tyre', lookup)).toBe('T AY ER');
		expect(pronounce('newtons', lookup)).toBe('N UW T AH N Z');
		expect(pronounce('nuts', lookup)).toBe('N AH T S');
		expect(pronounce('batches', lookup)).toBeNull();
		expect(pronounce('tickover', lookup)).toBe('T IH K OW V ER');
	});
	it('gives up on words it cannot build', () => {
		expect(pronounce('qwxz', lookup)).toBeNull();
		expect(pronounce('m8', lookup)).toBeNull();
	});
});

describe('spokenWords', () => {
	it('lower-cases, splits on punctuation and says digits as numbers', () => {
		expect(spokenWords('Leak check after warm-up')).toEqual([
			'leak',
			'check',
			'after',
			'warm',
			'up'
		]);
		expect(spokenWords('Cylinder 2 spark plug')).toEqual(['cylinder', 'two', 'spark', 'plug']);
		expect(spokenWords('M8 bolts')).toEqual(['m', 'eight', 'bolts']);
	});
});

describe('buildGrammar', () => {
	const steps = [
		{ label: 'Rear axle nut', aliases: ['axle nut', 'rear wheel spindle'], unit: 'N.m' },
		{ label: 'Engine oil fill', aliases: ['oil'], unit: 'L' },
		{ label: 'Idle speed', aliases: ['tickover'], unit: '/min' },
		{ label: 'Leak check', aliases: [] }
	];
	it('holds the job’s steps, intents, numbers and units', () => {
		const g = buildGrammar({ steps }, () => 'AH');
		expect(g.jsgf).toMatch(/^#JSGF V1\.0;/);
		expect(g.jsgf).toContain('<name> = (rear axle nut) | (axle nut) | (rear wheel spindle)');
		expect(g.jsgf).toContain('(engine oil fill) | oil | (idle speed) | tickover | (leak check);');
		// steps with a value take the units of the job's kinds, less the alike-sounding scale
		expect(g.jsgf).toContain(
			'<valuename> = (rear axle nut) | (axle nut) | (rear wheel spindle) | (engine oil fill) | oil'
		);
		expect(g.jsgf).toMatch(/^<valueunit> = .*\(newton metres\).*litres.*\(r p m\)/m);
		expect(g.jsgf).not.toMatch(/newton centimetres|volts|kilopascals/);
		// a check step is done, never given a value
		expect(g.jsgf).toContain('<checkname> (<donetail> | <parttail>)');
		expect(g.jsgf).toContain('<checkname> = (leak check);');
		for (const rule of ['next', 'undo', 'cancel', 'prefix', 'donetail', 'parttail', 'noteword']) {
			expect(g.jsgf).toContain(`<${rule}> =`);
		}
		expect(g.jsgf).toMatch(/<prefix> = .*spec.*\(mark done\).*\(fitted new\)/);
		expect(g.jsgf).toContain(
			'<call> = <valuename> (<number> [<valueunit>] | <donetail> | <parttail>) | <checkname> ('
		);
		expect(g.jsgf).toContain('| <prefix> <name> | note <noteword>+');
		expect(g.jsgf).toContain('<number> = <whole> [<decimals>] | <decimals>;');
		expect(g.jsgf).toContain('<decimals> = point <digit> [<digit> [<digit>]];');
		expect(g.jsgf).toContain('(hundred | thousand [<one> hundred]) [[and] <below100>]');
		expect(g.missing).toEqual([]);
	});
	it('lets a fill with a fluid spec be given its grade after the unit', () => {
		const withFluid = [
			steps[0],
			{ ...steps[1], fluid: 'SAE 10W-40, API SL or higher, JASO MA2' },
			{ label: 'Front brake fluid', aliases: [], unit: 'mL', fluid: 'DOT 4' }
		];
		const g = buildGrammar({ steps: withFluid }, () => 'AH');
		expect(g.jsgf).toContain(
			'<valuename> (<number> [<valueunit> | <fillunit> [<grade>]] | <donetail> | <parttail>)'
		);
		// the fills' units carry the grade, the torque step's do not
		expect(g.jsgf).toMatch(/^<valueunit> = \(newton metres\)[^;]*;$/m);
		expect(g.jsgf).not.toMatch(/^<valueunit> = [^;]*litres/m);
		expect(g.jsgf).toMatch(/^<fillunit> = [^;]*litres[^;]*millilitres/m);
		// each family once, in the order a spec is written, or a brake fluid class
		expect(g.jsgf).toContain('<grade> = <sae> [<api>] [<jaso>] | <api> [<jaso>] | <jaso> | <dot>;');
		expect(g.jsgf).toMatch(/^<sae> = .*\(ten w forty\).*\(twenty w fifty\)/m);
		expect(g.jsgf).toMatch(/^<api> = .*\(api s l\)/m);
		expect(g.jsgf).toMatch(/^<jaso> = .*\(jaso m a two\)/m);
		expect(g.jsgf).toMatch(/^<dot> = .*\(dot five point one\)/m);
		// no grade words in a job without a fluid spec
		expect(buildGrammar({ steps }, () => 'AH').jsgf).not.toContain('<grade>');
	});
	it('says each grade so the phrase engine reads it back (SAE J300, API 1509, JASO T 903, FMVSS 116)', () => {
		const oilSpec = 'SAE 10W-40, API SL or higher, JASO MA2';
		const f = gradeFamilies([oilSpec, 'DOT 4']);
		// the spec's own grade and the common ones; every family the specs name
		expect(f.sae).toContain('ten w forty');
		expect(f.sae).toContain('twenty w fifty');
		for (const fam of [f.api, f.jaso, f.dot]) expect(fam.length).toBeGreaterThan(3);
		const read = (label: string, unit: string, fluid: string, said: string) =>
			parsePhrase(`${label} ${said}`, { steps: [{ id: 'fill', label, unit, fluid }] });
		// every order the grammar allows: SAE, API, JASO in turn, one to three of them
		const oilCalls = [
			...f.sae.flatMap((sae) => [sae, `${sae} ${f.api[3]}`, `${sae} ${f.api[5]} ${f.jaso[2]}`]),
			...f.api.flatMap((api) => [api, `${api} ${f.jaso[1]}`]),
			...f.jaso
		];
		for (const grade of oilCalls) {
			const r = read('Engine oil fill', 'L', oilSpec, `one point one litres ${grade}`);
			expect(r.stepId, grade).toBe('fill');
			expect(r.quantity, grade).toEqual({ value: 1.1, unit: 'L' });
			expect(r.fluid, grade).not.toBeNull();
			expect(r.fluidVerdict, grade).not.toBe('not_stated');
		}
		for (const grade of f.dot) {
			const r = read('Front brake fluid', 'mL', 'DOT 4', `one hundred millilitres ${grade}`);
			expect(r.quantity, grade).toEqual({ value: 100, unit: 'mL' });
			expect(r.fluid, grade).toMatch(/^DOT /);
		}
		// worked cases: 10W-40 is a J300 grade the spec lists and JASO T 903's MA2 meets MA2;
		// MB never meets MA (common practice: the wet clutch slips)
		const r = read(
			'Engine oil fill',
			'L',
			oilSpec,
			'one point one litres ten w forty jaso m a two'
		);
		expect(r.fluid).toBe('SAE 10W-40 · JASO MA2');
		expect(r.fluidVerdict).toBe('meets');
		expect(
			read('Engine oil fill', 'L', oilSpec, 'one point one litres jaso m b').fluidVerdict
		).toBe('fails');
	});
	it('has an out-of-grammar path of single phones beside the calls, unless told not to', () => {
		const g = buildGrammar({ steps }, lookup);
		expect(g.jsgf).toMatch(/^public <top> = \/1\/ <call> \| \/[\d.e-]+\/ <garbage>;$/m);
		expect(g.jsgf).toMatch(/^<garbage> = \(zz_aa \| zz_ae .* \| zz_zh\)\+;$/m);
		expect(g.added).toContainEqual(['zz_ng', 'NG']);
		const plain = buildGrammar({ steps, garbage: 0 }, lookup);
		expect(plain.jsgf).toContain('public <call> = <valuename> (<number>');
		expect(plain.jsgf).not.toContain('zz_');
	});
	it('leaves out phrases with unknown words and lists those words', () => {
		const g = buildGrammar({ steps }, lookup);
		expect(g.missing).toContain('spindle');
		expect(g.missing).toContain('wheel');
		expect(g.jsgf).not.toContain('spindle');
		expect(g.jsgf).toContain('(rear axle nut)');
		expect(g.jsgf).toContain('tickover');
		expect(g.added).toContainEqual(['tickover', 'T IH K OW V ER']);
		expect(g.added).toContainEqual(['litres', 'L IY T ER Z']);
		// every word of the job's own rules has a pronunciation: the dictionary's or one made here
		const added = new Map(g.added);
		const ruleWords = g.jsgf
			.split('\n')
			.filter((l) => /^<(valuename|unit|noteword)> =/.test(l))
			.flatMap((l) => l.replace(/<[^>]+>/g, ' ').match(/[a-z']+/g) ?? []);
		expect(ruleWords.length).toBeGreaterThan(5);
		expect(ruleWords.filter((w) => !lookup(w) && !added.has(w))).toEqual([]);
	});
	it('lists each step and part once, parts beside steps', () => {
		const g = buildGrammar({ steps, parts: ['drain plug washer', 'rear axle nut'] }, () => 'AH');
		const names = g.jsgf.split('\n').find((l) => l.startsWith('<name> ='));
		expect(names).toContain('(drain plug washer)');
		expect(names?.match(/\(rear axle nut\)/g)).toHaveLength(1);
		expect(g.jsgf.match(/^<name> =/gm)).toHaveLength(1);
	});
	it('leaves out what cannot be said instead of writing <VOID>', () => {
		const g = buildGrammar({ steps: [] }, () => 'AH');
		expect(g.jsgf).not.toContain('<VOID>');
		expect(g.jsgf).not.toContain('<name>');
		expect(g.jsgf).toMatch(/<call> = note <noteword>\+ \| <next> \| <undo> \| <cancel>;/);
	});
});
