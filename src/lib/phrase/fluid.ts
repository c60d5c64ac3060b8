/**
 * The fluid grade in a called-out phrase, written or spoken: "10w30", "10W-40 jaso mb",
 * "ten w thirty api s n jaso m a two", "dot 5.1", "dot four". The grade's tokens are taken out
 * of the phrase so the rest (step words, quantity) reads as before. Never throws.
 */
import {
	brakeClass,
	formatGrade,
	isApiCategory,
	judgeGrade,
	parseFluidSpec,
	type FluidSpec,
	type Grade
} from '../oil/fluid';
import { parseSaeGrade } from '../oil/index';
import { isNumberWord, readNumberAt } from './numbers';
import type { StepSpec } from './types';

export type FluidVerdict = 'meets' | 'fails' | 'not_stated';

export interface SaidGrade {
	/** Null when no grade was said. */
	grade: Grade | null;
	/** The grade normalised, e.g. "SAE 10W-30 · API SN · JASO MA2"; null when none. */
	text: string | null;
	/** Unknown grades ("15W-35", "API XY", "DOT 6"). */
	problems: string[];
	/** The phrase's tokens without the grade. */
	rest: string[];
}

const MULTIGRADE_RE = /^(\d{1,2})w-(\d{1,2})$/;
const DOT_TOKEN_RE = /^dot(\d+(?:\.\d+)?)$/;
const JASO_TOKEN_RE = /^(ma[12]?|mb|f[bcd])$/;
const SUBCLASS: Record<string, string> = { '1': '1', '2': '2', one: '1', two: '2' };
const TRIGGER_RE = /^(?:sae|api|jaso|dot\d*(?:\.\d+)?|w|\d{1,2}w-\d{1,2})$/;

const upper = (s: string) => s.toUpperCase();
const isNumeric = (t: string | undefined) =>
	t !== undefined && (/^-?\d/.test(t) || isNumberWord(t));

/** Reads and removes the grade in a token list (from tokenize). */
export function extractGrade(tokens: string[]): SaidGrade {
	const out: SaidGrade = { grade: null, text: null, problems: [], rest: tokens };
	if (!tokens.some((t) => TRIGGER_RE.test(t))) return out;
	const g: Grade = { sae: [], api: null, jaso: null, dot: null };
	const used = new Array<boolean>(tokens.length).fill(false);
	const take = (from: number, to: number) => {
		for (let k = from; k < to; k++) used[k] = true;
	};
	let said = false;
	/** Unknown parts as said, kept in the text so the grade can be judged again later. */
	const unknown: string[] = [];
	/** One past the last grade token, for bare "sj" or "ma2" right after a grade. */
	let groupEnd = -1;

	const sae = (w: number, h: number | null, from: number, to: number) => {
		const text = h === null ? `SAE ${w}` : `${w}W-${h}`;
		const r = parseSaeGrade(text);
		if (r.grade) g.sae = [r.grade.winter === null ? `SAE ${r.grade.text}` : r.grade.text];
		else {
			out.problems.push(r.problem ?? `${text} is not an SAE J300 grade.`);
			unknown.push(h === null ? text : `SAE ${text}`);
		}
		said = true;
		take(from, to);
		groupEnd = to;
	};
	const jaso = (i: number): number => {
		// "ma2", "mb", "ma 2", "m a two", "m b"
		const t = tokens[i] ?? '';
		let cls: string | null = null;
		let end = i + 1;
		if (JASO_TOKEN_RE.test(t)) cls = t;
		else if (t === 'm' && (tokens[i + 1] === 'a' || tokens[i + 1] === 'b')) {
			cls = 'm' + tokens[i + 1];
			end = i + 2;
		}
		if (cls === 'ma' && SUBCLASS[tokens[end] ?? '']) {
			cls += SUBCLASS[tokens[end] ?? ''];
			end++;
		}
		if (!cls) return i;
		g.jaso = upper(cls);
		return end;
	};

	for (let i = 0; i < tokens.length; i++) {
		if (used[i]) continue;
		const t = tokens[i] as string;
		const multi = MULTIGRADE_RE.exec(t);
		if (multi) {
			sae(Number(multi[1]), Number(multi[2]), tokens[i - 1] === 'sae' ? i - 1 : i, i + 1);
			continue;
		}
		if (t === 'sae' || (t === 'w' && i > 0)) {
			// "sae 40", "sae ten w forty", "ten w thirty"
			const start = t === 'sae' ? i + 1 : findNumberBefore(tokens, i);
			const a = start === null ? null : readNumberAt(tokens, start);
			if (!a) continue;
			if (t === 'w' && a.end !== i) continue;
			if (tokens[a.end] === 'w') {
				const b = readNumberAt(tokens, a.end + 1);
				if (b && Number.isInteger(a.value) && Number.isInteger(b.value)) {
					sae(a.value, b.value, t === 'sae' ? i : a.start, b.end);
					i = b.end - 1;
				}
			} else if (t === 'sae' && Number.isInteger(a.value)) {
				sae(a.value, null, i, a.end);
				i = a.end - 1;
			}
			continue;
		}
		if (t === 'api') {
			const n = tokens[i + 1];
			let cat: string | null = null;
			let end = i + 2;
			if (n !== undefined && /^s[a-z]$/.test(n)) cat = n;
			else if (n === 's' && /^[a-z]$/.test(tokens[i + 2] ?? '')) {
				cat = 's' + tokens[i + 2];
				end = i + 3;
			}
			said = true;
			if (cat && isApiCategory(cat)) {
				g.api = upper(cat) + (tokens[end] === 'plus' ? ' PLUS' : '');
				if (tokens[end] === 'plus') end++;
			} else if (n !== undefined && /^[a-z]{1,2}\d?$/.test(n)) {
				unknown.push(`API ${upper(cat ?? n)}`);
				out.problems.push(
					`API ${upper(cat ?? n)} is not an API gasoline (S) category: say e.g. API SJ, SL, SN or SP.`
				);
			} else {
				out.problems.push('Say the API category after "API", e.g. "API SN".');
				end = i + 1;
			}
			take(i, end);
			groupEnd = end;
			i = end - 1;
			continue;
		}
		if (t === 'jaso') {
			const end = jaso(i + 1);
			said = true;
			if (end === i + 1) {
				const n = tokens[i + 1];
				if (n !== undefined && /^[a-z]{1,2}\d?$/.test(n)) unknown.push(`JASO ${upper(n)}`);
				out.problems.push(
					n !== undefined && /^[a-z]{1,2}\d?$/.test(n)
						? `JASO ${upper(n)} is not a JASO class: say MA, MA1, MA2 or MB.`
						: 'Say the JASO class after "JASO", e.g. "JASO MA2".'
				);
				take(i, n !== undefined && /^[a-z]{1,2}\d?$/.test(n) ? i + 2 : i + 1);
				continue;
			}
			take(i, end);
			groupEnd = end;
			i = end - 1;
			continue;
		}
		const dotToken = DOT_TOKEN_RE.exec(t);
		if (dotToken || (t === 'dot' && !isNumeric(tokens[i - 1]))) {
			// at most "five point one": the quantity may follow ("dot 4 100 ml")
			const n = dotToken
				? { decimal: dotToken[1] as string, end: i + 1 }
				: readNumberAt(tokens.slice(0, i + 4), i + 1);
			if (!n) continue;
			const c = brakeClass(n.decimal);
			if (c.dot) g.dot = c.dot;
			else {
				out.problems.push(c.problem as string);
				unknown.push(`DOT ${n.decimal}`);
			}
			said = true;
			take(i, n.end);
			i = n.end - 1;
			continue;
		}
		if (i === groupEnd) {
			// bare parts right after a grade: "10w-30 sj ma2", "api sn mb"
			if (isApiCategory(t) && /^s[g-z]$/.test(t)) {
				g.api = upper(t);
				take(i, i + 1);
				groupEnd = i + 1;
				continue;
			}
			const end = jaso(i);
			if (end > i) {
				take(i, end);
				groupEnd = end;
				i = end - 1;
			}
		}
	}
	if (!said && g.jaso === null) return out;
	out.rest = tokens.filter((_, k) => !used[k]);
	if (g.sae.length || g.api || g.jaso || g.dot) out.grade = g;
	const text = [out.grade ? formatGrade(g) : '', ...unknown].filter(Boolean).join(' · ');
	out.text = text || null;
	return out;
}

/** Start of the number that ends right before token i ("ten", "twenty five"), or null. */
function findNumberBefore(tokens: string[], i: number): number | null {
	for (let s = Math.max(0, i - 3); s < i; s++) {
		const n = readNumberAt(tokens, s);
		if (n && n.end === i) return s;
	}
	return null;
}

const FLUID_SPECS = new WeakMap<StepSpec, { text: string; spec: FluidSpec | null }>();

/** The step's fluid spec, read once per step object and text. */
export function stepFluidSpec(step: StepSpec): FluidSpec | null {
	const text = typeof step.fluid === 'string' ? step.fluid : '';
	const hit = FLUID_SPECS.get(step);
	if (hit && hit.text === text) return hit.spec;
	const spec = parseFluidSpec(text);
	FLUID_SPECS.set(step, { text, spec });
	return spec;
}

/**
 * A stated grade (ParsedPhrase.fluid, or null) against a step's fluid spec: the verdict and what
 * to say (why it fails, the wet-clutch caution, or the prompt for a grade not stated). Null when
 * the step has no usable fluid spec.
 */
export function fluidJudgement(
	step: StepSpec,
	fluid: string | null
): { verdict: FluidVerdict; problems: string[] } | null {
	const spec = stepFluidSpec(step);
	if (!spec || spec.problems.length > 0) return null;
	if (fluid === null) {
		const example = spec.dot
			? `dot ${spec.dot}`
			: [spec.sae[0], spec.jaso ? `jaso ${spec.jaso}` : spec.api ? `api ${spec.api}` : null]
					.filter(Boolean)
					.join(' ')
					.toLowerCase();
		return {
			verdict: 'not_stated',
			problems: [
				`Grade not stated: ${step.label || 'This step'} calls for ${formatGrade(spec, ', ')}. Say the grade too, e.g. "${example}".`
			]
		};
	}
	const stated = parseFluidSpec(fluid);
	if (!stated || stated.problems.length > 0) {
		return { verdict: 'fails', problems: stated?.problems ?? [] };
	}
	const j = judgeGrade(spec, stated);
	return { verdict: j.verdict, problems: j.caution ? [...j.reasons, j.caution] : j.reasons };
}
