/**
 * The invented vocabulary and phrases that `npm run bench:phrase` times, apart so a profiling
 * run can use the same ones. Every label and spec here is an invented demo value.
 */
import type { StepSpec } from '../src/lib/phrase/index';

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

export function vocabulary(n: number): StepSpec[] {
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

/** What each phrase exercises, so a slow kind stands out in the table. */
export const PHRASES: [kind: string, phrase: string][] = [
	['measure', 'rear axle nut 85 nm'],
	['measure', 'swingarm pivot 8.5 kgf m'],
	['measure', 'fork oil 4.5 fl oz'],
	['measure', 'brake pedal play thirty five'],
	['ago', 'rear axel nut eighty five newton metres 5 minutes ago'],
	['spec', 'spec fork fluid'],
	['spec', "what's the spec for the brake pedal free play"],
	['part', 'new drain plug washer'],
	['note', 'note left fork seal weeping'],
	['next', 'next'],
	['undo', 'undo'],
	['done', 'done test ride'],
	['measure', 'cylinder two exhaust valve clearance zero point two'],
	['clock', 'oil 1.1 L filled at 08:30'],
	['clock', 'front brake reservoir 40 ml yesterday at 4 pm'],
	['grade', 'sump refill ten w forty jaso m a two 1.2 litres'],
	['grade', 'front brake reservoir dot 5.1 40 ml'],
	['adapter', 'rear axle nut 88 nm with a 50 mm crowfoot back'],
	['unknown', 'blorp snark wibble'],
	['long', 'x'.repeat(10_000)]
];
