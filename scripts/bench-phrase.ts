/**
 * Phrase engine benchmark: builds invented vocabularies of 500 and 5,000 steps and prints the
 * measured p50 / p99 parse time per phrase. It prints figures only; nothing here is asserted.
 * Goal: p99 ≤ 1 ms at 500 steps, ≤ 5 ms at 5,000, on a 2-core machine.
 *
 *   npm run bench:phrase
 */
import { performance } from 'node:perf_hooks';
import { createPhraseParser, type StepSpec } from '../src/lib/phrase/index';

// A small deterministic generator, so every run measures the same vocabulary.
function rng(seed: number): () => number {
	let s = seed >>> 0;
	return () => {
		s = (s * 1664525 + 1013904223) >>> 0;
		return s / 2 ** 32;
	};
}

const SIDES = ['front', 'rear', 'left', 'right', 'upper', 'lower', 'inner', 'outer', ''];
const PLACES = [
	'axle',
	'swingarm pivot',
	'caliper',
	'fork',
	'handlebar',
	'footrest',
	'engine mount',
	'sprocket',
	'brake disc',
	'shock absorber',
	'exhaust',
	'cylinder head',
	'clutch',
	'kickstand',
	'top yoke',
	'bottom yoke',
	'steering stem',
	'wheel hub',
	'radiator',
	'crankcase',
	'oil filter',
	'drain plug',
	'camshaft cap',
	'valve cover',
	'starter motor',
	'fuel tank',
	'rear set',
	'chain guide',
	'mudguard',
	'seat rail'
];
const THINGS: [string, string, number, number][] = [
	['nut', 'N.m', 20, 120],
	['bolt', 'N.m', 8, 60],
	['screw', 'N.m', 2, 12],
	['bolts', 'kgf.m', 0.8, 6],
	['clearance', 'mm', 0.05, 0.3],
	['free play', 'mm', 2, 30],
	['fluid', 'mL', 80, 600],
	['oil', 'L', 0.6, 4],
	['pressure', 'kPa', 150, 300],
	['voltage', 'V', 11, 15],
	['speed', '/min', 1000, 2000],
	['temperature', 'Cel', 80, 110]
];

function vocabulary(n: number): StepSpec[] {
	const r = rng(n);
	const pick = <T>(xs: T[]): T => xs[Math.floor(r() * xs.length)] as T;
	const steps: StepSpec[] = [];
	for (let i = 0; i < n; i++) {
		const [thing, unit, lo, hi] = pick(THINGS);
		const side = pick(SIDES);
		const place = pick(PLACES);
		const nominal = Number((lo + r() * (hi - lo)).toPrecision(3));
		steps.push({
			id: `s${i}`,
			label: [side, place, thing, i % 7 === 0 ? `cylinder ${1 + (i % 4)}` : '']
				.filter(Boolean)
				.join(' '),
			aliases: i % 5 === 0 ? [`${place} ${thing} ${i}`] : [],
			unit,
			min: Number((nominal * 0.9).toPrecision(3)),
			max: Number((nominal * 1.1).toPrecision(3)),
			done: i < n / 3
		});
	}
	// the steps the phrases below aim at
	steps.push(
		{ id: 'axle', label: 'Rear axle nut', unit: 'N.m', min: 80, max: 90 },
		{ id: 'fork', label: 'Fork oil', aliases: ['fork fluid'], unit: 'mL', min: 115, max: 125 },
		{ id: 'play', label: 'Brake pedal free play', unit: 'mm', min: 20, max: 30 },
		// demo fluid specs (SAE J300, API, JASO T 903 grades)
		{
			id: 'sump',
			label: 'Sump refill',
			unit: 'L',
			min: 1.1,
			max: 1.3,
			fluid: 'SAE 10W-40, JASO MA2'
		},
		{ id: 'reservoir', label: 'Front brake reservoir', unit: 'mL', nominal: 40, fluid: 'DOT 4' }
	);
	return steps;
}

const PHRASES = [
	'rear axle nut 85 nm',
	'swingarm pivot 8.5 kgf m',
	'fork oil 4.5 fl oz',
	'brake pedal play thirty five',
	'rear axel nut eighty five newton metres 5 minutes ago',
	'spec fork fluid',
	"what's the spec for the brake pedal free play",
	'new drain plug washer',
	'note left fork seal weeping',
	'next',
	'undo',
	'done test ride',
	'cylinder two exhaust valve clearance zero point two',
	'oil 1.1 L filled at 08:30',
	'sump refill ten w forty jaso m a two 1.2 litres',
	'front brake reservoir dot 5.1 40 ml',
	'rear axle nut 88 nm with a 50 mm crowfoot back',
	'blorp snark wibble',
	'x'.repeat(10_000)
];

function percentile(sorted: number[], p: number): number {
	const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
	return sorted[i] ?? Number.NaN;
}

const fmt = (ms: number) => (ms < 1 ? `${(ms * 1000).toFixed(0)} µs` : `${ms.toFixed(2)} ms`);

const ITERATIONS = Number(process.env.BENCH_ITERATIONS ?? 1000);
const WARMUP = 300;
const now = new Date('2026-12-02T09:00:00Z');

for (const size of [500, 5000]) {
	const steps = vocabulary(size - 5);
	const t0 = performance.now();
	const parser = createPhraseParser(steps);
	const buildMs = performance.now() - t0;
	console.log(
		`\n${steps.length} steps — index built in ${fmt(buildMs)}; ${ITERATIONS} timed parses per phrase after ${WARMUP} warm-up parses`
	);
	console.log('phrase'.padEnd(56), 'p50'.padStart(9), 'p99'.padStart(9), '  first match');
	let worstP99 = 0;
	for (const phrase of PHRASES) {
		const opts = { now, timeZone: 'Europe/Berlin' };
		// warm-up: JIT, and the per-word similarity cache a live call bar would also have
		for (let i = 0; i < WARMUP; i++) parser.parse(phrase, opts);
		const times: number[] = [];
		let result = parser.parse(phrase, opts);
		for (let i = 0; i < ITERATIONS; i++) {
			const a = performance.now();
			result = parser.parse(phrase, opts);
			times.push(performance.now() - a);
		}
		times.sort((a, b) => a - b);
		const p99 = percentile(times, 99);
		worstP99 = Math.max(worstP99, p99);
		const label = phrase.length > 54 ? phrase.slice(0, 40) + `… (${phrase.length} chars)` : phrase;
		console.log(
			label.padEnd(56),
			fmt(percentile(times, 50)).padStart(9),
			fmt(p99).padStart(9),
			`  ${result.intent} ${result.stepId ?? '-'} ${result.verdict ?? ''} ${result.fluidVerdict ?? ''}`
		);
	}
	// cold: a fresh parser for each of a few phrases, so no word is cached yet
	const cold: number[] = [];
	for (let k = 0; k < 20; k++) {
		const fresh = createPhraseParser([...steps]);
		const phrase = PHRASES[k % PHRASES.length] as string;
		const a = performance.now();
		fresh.parse(phrase, { now, timeZone: 'Europe/Berlin' });
		cold.push(performance.now() - a);
	}
	cold.sort((a, b) => a - b);
	console.log(
		`worst p99 (warm) ${fmt(worstP99)}; first parse on a new vocabulary p50 ${fmt(percentile(cold, 50))}, max ${fmt(percentile(cold, 100))}`
	);
}
