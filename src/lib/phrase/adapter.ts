/**
 * An adapter on the torque wrench, said in the phrase: "rear axle 88 Nm adapter 50 mm",
 * "with a 50 mm extension", "crowfoot 45 mm back", "crowfoot at 90", "fifty millimetre adapter".
 * The adapter's words are taken out so the rest (step words, torque) reads as before. A trigger
 * word with no length and no angle is left alone: it may be part of a step's name. Never throws.
 */
import type { Adapter } from '../torque/adapter';
import { convert } from '../units';
import { readNumberAt } from './numbers';

export interface SaidAdapter {
	adapter: Adapter | null;
	problems: string[];
	/** The phrase's tokens without the adapter's words. */
	rest: string[];
}

const TRIGGERS = new Set(['adapter', 'adaptor', 'extension', 'crowfoot', 'offset']);
const LENGTH_UNITS: Record<string, string> = {
	mm: 'mm',
	millimetre: 'mm',
	millimetres: 'mm',
	millimeter: 'mm',
	millimeters: 'mm',
	mil: 'mm',
	cm: 'cm',
	centimetre: 'cm',
	centimetres: 'cm',
	centimeter: 'cm',
	centimeters: 'cm',
	in: '[in_i]',
	inch: '[in_i]',
	inches: '[in_i]',
	'"': '[in_i]'
};
const DEGREES = new Set(['deg', 'degree', 'degrees', '°']);
const BACK = new Set(['back', 'backwards', 'backward', 'reversed', 'reverse', 'inward', 'inwards']);
const SQUARE = new Set(['square', 'perpendicular']);
const GLUE = new Set([
	'with',
	'a',
	'an',
	'on',
	'using',
	'at',
	'pointing',
	'facing',
	'turned',
	'the'
]);
/** Longest adapter Benchcall takes as said (a metre): anything longer is a misheard number. */
const MAX_MM = 1000;

/** Reads and removes an adapter from a token list (from tokenize). */
export function extractAdapter(tokens: string[]): SaidAdapter {
	const out: SaidAdapter = { adapter: null, problems: [], rest: tokens };
	// "crow foot" said as two words
	const t = tokens.findIndex(
		(w, i) => TRIGGERS.has(w) || (w === 'crow' && tokens[i + 1] === 'foot')
	);
	if (t < 0) return out;
	const used = new Set<number>([t]);
	if (tokens[t] === 'crow') used.add(t + 1);
	const triggerEnd = tokens[t] === 'crow' ? t + 2 : t + 1;

	let lengthMm: number | null = null;
	let square = false;
	let back = false;
	// a length or an angle from three words before the trigger to four after it
	for (let i = Math.max(0, t - 3); i < Math.min(tokens.length, triggerEnd + 4); i++) {
		if (used.has(i)) continue;
		const n = readNumberAt(tokens, i);
		if (!n) continue;
		const unitWord = tokens[n.end] ?? '';
		const unit = LENGTH_UNITS[unitWord];
		if (unit && lengthMm === null) {
			lengthMm = convert(n.value, unit, 'mm');
			for (let k = n.start; k <= n.end; k++) used.add(k);
			i = n.end;
		} else if (n.value === 90 && (DEGREES.has(unitWord) || tokens[n.start - 1] === 'at')) {
			square = true;
			for (let k = n.start; k < n.end; k++) used.add(k);
			if (DEGREES.has(unitWord)) used.add(n.end);
			i = n.end - 1;
		}
	}
	for (let i = Math.max(0, t - 3); i < Math.min(tokens.length, triggerEnd + 6); i++) {
		const w = tokens[i] ?? '';
		if (BACK.has(w) || (w === 'towards' && tokens[i + 1] === 'hand')) {
			back = true;
			used.add(i);
			if (w === 'towards') used.add(i + 1);
		} else if (SQUARE.has(w) || (w === 'right' && /^angles?$/.test(tokens[i + 1] ?? ''))) {
			square = true;
			used.add(i);
			if (w === 'right') used.add(i + 1);
		}
	}
	if (lengthMm === null && !square) {
		if (!back) return out;
		out.problems.push('Say the adapter’s length with its unit, e.g. "adapter 50 mm back".');
	}
	// connecting words right next to what was taken
	for (const i of [...used]) {
		for (const k of [i - 1, i + 1, i - 2]) {
			if (!used.has(k) && GLUE.has(tokens[k] ?? '') && (used.has(k + 1) || used.has(k - 1)))
				used.add(k);
		}
	}
	out.rest = tokens.filter((_, i) => !used.has(i));
	if (lengthMm !== null && (!Number.isFinite(lengthMm) || lengthMm < 0 || lengthMm > MAX_MM)) {
		out.problems.push(`An adapter of ${Math.round(lengthMm)} mm is not one Benchcall can take.`);
		return out;
	}
	if (square) out.adapter = { lengthMm: lengthMm ?? 0, direction: 'square' };
	else if (lengthMm !== null) out.adapter = { lengthMm, direction: back ? 'back' : 'out' };
	return out;
}
