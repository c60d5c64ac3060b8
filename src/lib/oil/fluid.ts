/**
 * A step's fluid spec as the manual writes it ("SAE 10W-30, API SJ or higher, JASO MA",
 * "SAE 10W-40, JASO MA2", "DOT 4") and the judgement of a stated grade against it:
 * - SAE J300: the stated viscosity grade must be one the spec lists;
 * - API 1509: S categories are ordered and a later one meets an earlier minimum;
 * - JASO T 903: MA1 and MA2 are subclasses of MA; MA2 asks for MA2; MB never meets MA;
 * - FMVSS No. 116: DOT 3 < DOT 4 < DOT 5.1 by minimum boiling points; silicone DOT 5 and the
 *   glycol classes never stand in for each other (common practice: never mixed).
 * Pure functions; never throw.
 */
import { API_S_CATEGORIES, parseOilGrade, satisfiesApi, satisfiesJaso } from './index';

/** FMVSS No. 116 brake fluid classes with their minimum dry / wet boiling points in °C. */
export const BRAKE_FLUIDS: Record<
	string,
	{ dry: number; wet: number; base: 'glycol' | 'silicone' }
> = {
	'3': { dry: 205, wet: 140, base: 'glycol' },
	'4': { dry: 230, wet: 155, base: 'glycol' },
	'5.1': { dry: 260, wet: 180, base: 'glycol' },
	'5': { dry: 260, wet: 180, base: 'silicone' }
};

/** A grade as stated at the bench, or the parts a spec asks for. */
export interface Grade {
	/** J300 grades: one when stated, every one the spec lists for a spec ('10W-30'). */
	sae: string[];
	/** API S category ('SN', 'SN PLUS'); a spec's minimum. */
	api: string | null;
	/** JASO class ('MA2', 'MB'). */
	jaso: string | null;
	/** Brake fluid class ('4', '5.1'). */
	dot: string | null;
}

export interface FluidSpec extends Grade {
	/** What makes the spec unreadable; empty when it is good. */
	problems: string[];
}

const SAE_ALL_RE = /\b(\d{1,2})\s*W\s*[-/ ]?\s*(\d{1,2})\b/gi;
const DOT_RE = /\bDOT\s*(\d+(?:[.,]\d+)?)\b/i;

/** The brake fluid class for 'DOT n', or a problem naming the classes that exist. */
export function brakeClass(n: string): { dot: string | null; problem: string | null } {
	const c = n.replace(',', '.').replace(/\.0$/, '');
	if (BRAKE_FLUIDS[c]) return { dot: c, problem: null };
	return {
		dot: null,
		problem: `DOT ${n} is not a brake fluid class of FMVSS 116: say DOT 3, DOT 4, DOT 5.1 or DOT 5.`
	};
}

/** Reads a fluid spec as written in a manual. An empty spec reads as no spec (null). */
export function parseFluidSpec(text: string | null | undefined): FluidSpec | null {
	if (typeof text !== 'string' || text.trim() === '') return null;
	const s = text
		.normalize('NFKC')
		.replace(/[\u2010-\u2015\u2212]/g, '-')
		.slice(0, 300);
	const spec: FluidSpec = { sae: [], api: null, jaso: null, dot: null, problems: [] };
	const dot = DOT_RE.exec(s);
	if (dot && dot[1]) {
		const c = brakeClass(dot[1]);
		spec.dot = c.dot;
		if (c.problem) spec.problems.push(c.problem);
		return spec;
	}
	for (const m of s.matchAll(SAE_ALL_RE)) {
		const one = parseOilGrade(`${m[1]}W-${m[2]}`);
		if (one.sae && one.valid) {
			if (!spec.sae.includes(one.sae.text)) spec.sae.push(one.sae.text);
		} else spec.problems.push(...one.problems);
	}
	const rest = s.replace(SAE_ALL_RE, ' ');
	const g = parseOilGrade(rest);
	if (g.sae && !g.sae.winter) spec.sae.push(`SAE ${g.sae.text}`);
	spec.api = g.api;
	spec.jaso = g.jaso;
	const own = g.problems.filter((p) => !p.startsWith('No SAE') && !p.startsWith('No oil grade'));
	spec.problems.push(...own);
	if (spec.sae.length === 0 && !spec.api && !spec.jaso && spec.problems.length === 0) {
		spec.problems.push(
			`No fluid grade found in "${s.trim().slice(0, 60)}": write it as the manual does, e.g. "SAE 10W-30, API SJ, JASO MA" or "DOT 4".`
		);
	}
	return spec;
}

/** A grade as text: "SAE 10W-30 · API SN · JASO MA2", "DOT 4". */
export function formatGrade(g: Grade, sep = ' · '): string {
	if (g.dot) return `DOT ${g.dot}`;
	return [
		g.sae.length ? g.sae.map((x) => (x.startsWith('SAE') ? x : `SAE ${x}`)).join(' or ') : null,
		g.api ? `API ${g.api}` : null,
		g.jaso ? `JASO ${g.jaso}` : null
	]
		.filter(Boolean)
		.join(sep);
}

export interface GradeJudgement {
	verdict: 'meets' | 'fails';
	/** Why it fails, one sentence per failing part. */
	reasons: string[];
	/** The wet-clutch caution when a wrong JASO class goes into an engine that asks for MA. */
	caution: string | null;
}

/** Judges a stated grade against a spec: every stated part must meet what the spec asks. */
export function judgeGrade(spec: Grade, stated: Grade): GradeJudgement {
	const out: GradeJudgement = { verdict: 'meets', reasons: [], caution: null };
	const statedOil = stated.sae.length > 0 || stated.api !== null || stated.jaso !== null;
	if (spec.dot) {
		if (statedOil && !stated.dot) {
			out.reasons.push(`This step takes brake fluid DOT ${spec.dot}, not engine oil.`);
		} else if (stated.dot) {
			const want = BRAKE_FLUIDS[spec.dot];
			const got = BRAKE_FLUIDS[stated.dot];
			if (want && got && want.base !== got.base) {
				out.reasons.push(
					got.base === 'silicone'
						? `DOT 5 is silicone-based and never goes into a system that takes glycol DOT ${spec.dot}.`
						: `DOT ${stated.dot} is glycol-based and never goes into a silicone DOT 5 system.`
				);
			} else if (want && got && (got.dry < want.dry || got.wet < want.wet)) {
				out.reasons.push(
					`DOT ${stated.dot} boils lower than DOT ${spec.dot} asks (FMVSS 116: ${got.dry} / ${got.wet} °C against ${want.dry} / ${want.wet} °C).`
				);
			}
		}
	} else {
		if (stated.dot)
			out.reasons.push(`This step takes engine oil (${formatGrade(spec)}), not brake fluid.`);
		const said = stated.sae[0];
		if (said && spec.sae.length > 0 && !spec.sae.includes(said)) {
			out.reasons.push(`SAE ${said} is not a grade the spec lists (${spec.sae.join(' or ')}).`);
		}
		if (stated.api && spec.api && !satisfiesApi(spec.api, stated.api)) {
			out.reasons.push(`API ${stated.api} is older than the API ${spec.api} the spec asks for.`);
		}
		if (stated.jaso && spec.jaso && !satisfiesJaso(spec.jaso, stated.jaso)) {
			out.reasons.push(
				`JASO ${stated.jaso} does not meet the JASO ${spec.jaso} the spec asks for.`
			);
			if (spec.jaso.startsWith('MA')) {
				out.caution =
					stated.jaso === 'MB'
						? 'Caution: JASO MB is a low-friction oil; in a wet clutch it can make the clutch slip. Drain it and fill the class the manual gives.'
						: `Caution: this engine has a wet clutch and asks for JASO ${spec.jaso}; a lower-friction oil can make the clutch slip.`;
			}
		}
	}
	if (out.reasons.length > 0) out.verdict = 'fails';
	return out;
}

/** Whether a token is an API gasoline category ('sn', 'sj'). */
export function isApiCategory(token: string): boolean {
	return (API_S_CATEGORIES as readonly string[]).includes(token.toUpperCase());
}
