/**
 * Engine oil grades as written on a can or called out at the bench: SAE J300 viscosity grade,
 * API service category, JASO class. "SAE 10W-30, API SJ, JASO MA", "10W-30 SJ MA2", "10w40 MB".
 * Pure functions; never throw.
 */

/** SAE J300 winter (W) grades and high-temperature grades (SAE J300, 2015 table as reproduced). */
export const SAE_WINTER_GRADES = [0, 5, 10, 15, 20, 25] as const;
export const SAE_HOT_GRADES = [8, 12, 16, 20, 30, 40, 50, 60] as const;

/**
 * Kinematic viscosity at 100 °C in mm²/s: the winter grades' minimum, and each hot grade's
 * range [min, max). From the SAE J300 table as remembered [MEM]; only used to rule out
 * multigrades whose two halves cannot both hold (25W-20: 25W needs ≥ 9.3, grade 20 is < 9.3).
 */
const WINTER_MIN_KV100: Record<number, number> = {
	0: 3.8,
	5: 3.8,
	10: 4.1,
	15: 5.6,
	20: 5.6,
	25: 9.3
};
const HOT_KV100: Record<number, [number, number]> = {
	8: [4.0, 6.1],
	12: [5.0, 7.1],
	16: [6.1, 8.2],
	20: [6.9, 9.3],
	30: [9.3, 12.5],
	40: [12.5, 16.3],
	50: [16.3, 21.9],
	60: [21.9, 26.1]
};

/** API gasoline (S) categories in order; SI and SK were never issued. */
export const API_S_CATEGORIES = [
	'SA',
	'SB',
	'SC',
	'SD',
	'SE',
	'SF',
	'SG',
	'SH',
	'SJ',
	'SL',
	'SM',
	'SN',
	'SP',
	'SQ'
] as const;
const API_OBSOLETE = new Set(['SA', 'SB', 'SC', 'SD', 'SE', 'SF', 'SG', 'SH']);

/** JASO T 903 four-stroke classes and JASO M 345 two-stroke classes. */
export const JASO_FOUR_STROKE = ['MA', 'MA1', 'MA2', 'MB'] as const;
export const JASO_TWO_STROKE = ['FB', 'FC', 'FD'] as const;

export interface SaeGrade {
	/** Winter grade number (10 for 10W), or null for a monograde like SAE 40. */
	winter: number | null;
	/** High-temperature grade (30 for 10W-30), or null for a winter-only grade like 10W. */
	hot: number | null;
	/** Canonical form: '10W-30', '40', '10W'. */
	text: string;
}

export interface OilGrade {
	sae: SaeGrade | null;
	/** 'SJ', 'SN PLUS' … */
	api: string | null;
	/** 'MA', 'MA2', 'MB', 'FC' … */
	jaso: string | null;
	/** True when something was read and nothing is wrong (warnings allowed). */
	valid: boolean;
	/** What makes it invalid: not a J300 grade, not an API category … */
	problems: string[];
	/** Valid but worth saying: obsolete API category, MB oil and wet clutches. */
	warnings: string[];
}

const SAE_MULTI_RE = /\b(\d{1,2})\s*W\s*[-/ ]?\s*(\d{1,2})\b/i;
const SAE_WINTER_RE = /\b(\d{1,2})\s*W\b/i;
const SAE_MONO_RE = /\bSAE\s*(\d{1,2})\b(?!\s*W)/i;
const API_RE = /\b(?:API\s*)?(S[A-Z])(\s*PLUS)?\b/i;
const API_ANY_RE = /\bAPI\s*([A-Z]{1,2}(?:-\d)?)\b/i;
const JASO_RE = /\b(?:JASO\s*(?:T\s*903\s*:?\s*\d*\s*)?)?(MA[12]?|MB|F[ABCD])\b/i;
const JASO_ANY_RE = /\bJASO\s*([A-Z]{1,2}\d?)\b/i;

/** Whether a multigrade can exist in SAE J300 (25W-20 cannot). */
export function isJ300Multigrade(winter: number, hot: number): boolean {
	const wMin = WINTER_MIN_KV100[winter];
	const range = HOT_KV100[hot];
	if (wMin === undefined || range === undefined) return false;
	return range[1] > wMin;
}

/** Reads the SAE part: '10W-30', '10w40', '10W/30', 'SAE 40', '20W'. */
export function parseSaeGrade(text: string): { grade: SaeGrade | null; problem: string | null } {
	const s = typeof text === 'string' ? text.slice(0, 200) : '';
	const multi = SAE_MULTI_RE.exec(s);
	if (multi) {
		const w = Number(multi[1]);
		const h = Number(multi[2]);
		const t = `${w}W-${h}`;
		if (!(SAE_WINTER_GRADES as readonly number[]).includes(w)) {
			return {
				grade: null,
				problem: `${t} is not an SAE J300 grade: ${w}W is not a winter grade.`
			};
		}
		if (!(SAE_HOT_GRADES as readonly number[]).includes(h)) {
			return {
				grade: null,
				problem: `${t} is not an SAE J300 grade: ${h} is not a viscosity grade.`
			};
		}
		if (!isJ300Multigrade(w, h)) {
			return {
				grade: null,
				problem: `${t} is not an SAE J300 grade: a ${w}W oil is too thick at 100 °C to be a ${h}.`
			};
		}
		return { grade: { winter: w, hot: h, text: t }, problem: null };
	}
	const winter = SAE_WINTER_RE.exec(s);
	if (winter) {
		const w = Number(winter[1]);
		if (!(SAE_WINTER_GRADES as readonly number[]).includes(w)) {
			return { grade: null, problem: `${w}W is not an SAE J300 winter grade.` };
		}
		return { grade: { winter: w, hot: null, text: `${w}W` }, problem: null };
	}
	const mono = SAE_MONO_RE.exec(s);
	if (mono) {
		const h = Number(mono[1]);
		if (!(SAE_HOT_GRADES as readonly number[]).includes(h)) {
			return { grade: null, problem: `SAE ${h} is not an SAE J300 grade.` };
		}
		return { grade: { winter: null, hot: h, text: String(h) }, problem: null };
	}
	return { grade: null, problem: null };
}

/**
 * Parses and checks an oil grade. "SAE 10W-30, API SJ, JASO MA" and "10W-30 SJ MA2" are valid;
 * "25W-20" is not a J300 grade; "API SK" was never issued; "JASO MB" is valid with a warning
 * that it is not for wet clutches.
 */
export function parseOilGrade(text: string): OilGrade {
	const out: OilGrade = {
		sae: null,
		api: null,
		jaso: null,
		valid: false,
		problems: [],
		warnings: []
	};
	if (typeof text !== 'string' || text.trim() === '') {
		out.problems.push('No oil grade given, e.g. "SAE 10W-30, API SL, JASO MA2".');
		return out;
	}
	const s = text
		.normalize('NFKC')
		.replace(/[\u2010-\u2015\u2212]/g, '-')
		.slice(0, 200);

	const sae = parseSaeGrade(s);
	out.sae = sae.grade;
	if (sae.problem) out.problems.push(sae.problem);
	// take the SAE part out so '10W-30' cannot be read as anything else
	const rest = s.replace(SAE_MULTI_RE, ' ').replace(SAE_WINTER_RE, ' ').replace(SAE_MONO_RE, ' ');

	const api = API_RE.exec(rest);
	if (api && api[1]) {
		const cat = api[1].toUpperCase();
		if (!(API_S_CATEGORIES as readonly string[]).includes(cat)) {
			out.problems.push(
				`API ${cat} is not an API gasoline category (SI and SK were never issued).`
			);
		} else {
			out.api = cat + (api[2] ? ' PLUS' : '');
			if (API_OBSOLETE.has(cat)) {
				out.warnings.push(`API ${cat} is obsolete; current categories start at SJ.`);
			}
		}
	} else {
		const other = API_ANY_RE.exec(rest);
		if (other && other[1]) {
			out.problems.push(`API ${other[1].toUpperCase()} is not an API gasoline (S) category.`);
		}
	}

	const jaso = JASO_RE.exec(rest);
	if (jaso && jaso[1]) {
		const cls = jaso[1].toUpperCase();
		if (cls === 'FA') {
			out.problems.push('JASO FA was withdrawn; two-stroke classes are FB, FC and FD.');
		} else {
			out.jaso = cls;
			if (cls === 'MB') {
				out.warnings.push(
					'JASO MB is a low-friction oil: not for wet clutches (use MA, MA1 or MA2).'
				);
			}
		}
	} else {
		const other = JASO_ANY_RE.exec(rest);
		if (other && other[1]) out.problems.push(`JASO ${other[1].toUpperCase()} is not a JASO class.`);
	}

	if (!out.sae && !out.api && !out.jaso && out.problems.length === 0) {
		out.problems.push(`No SAE, API or JASO grade found in "${s.trim().slice(0, 60)}".`);
	}
	out.valid = out.problems.length === 0;
	return out;
}

/** Whether an oil's JASO class meets a required one: MA1 and MA2 both satisfy MA. */
export function satisfiesJaso(required: string, oil: string): boolean {
	const r = String(required).toUpperCase();
	const o = String(oil).toUpperCase();
	if (r === o) return true;
	if (r === 'MA') return o === 'MA1' || o === 'MA2';
	return false;
}

/** Whether an oil's API S category meets a required one: a later category covers earlier ones. */
export function satisfiesApi(required: string, oil: string): boolean {
	const cats = API_S_CATEGORIES as readonly string[];
	const r = cats.indexOf(
		String(required)
			.toUpperCase()
			.replace(/\s*PLUS$/, '')
	);
	const o = cats.indexOf(
		String(oil)
			.toUpperCase()
			.replace(/\s*PLUS$/, '')
	);
	return r >= 0 && o >= 0 && o >= r;
}
