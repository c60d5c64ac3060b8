// A draft invoice from a job's log. Pure: the server loads the rows, this decides the lines.
import Fuse from 'fuse.js';
import { canConvert, convert } from '$lib/units';
import { clockTime } from './labour';
import { pickByGrade } from './fluid';
import { liveEntries } from '$lib/log/live';

export type LineKind = 'part' | 'fluid' | 'labour' | 'sundry' | 'discount';
export type LabourMode = 'flat_rate' | 'clock';

export interface PriceListPart {
	id: string;
	code: string;
	description: string;
	unit: 'each' | 'L' | 'mL';
	priceMinor: number;
	active: boolean;
	/** A fluid's grade as the price list writes it ("SAE 10W-40, JASO MA2", "DOT 4"). */
	fluid?: string | null;
}

export interface JobStepRow {
	id: string;
	label: string;
	position: number;
	partId: string | null;
	partQuantity: number | null;
}

export interface LogRow {
	id: string;
	kind: string;
	jobStepId: string | null;
	authorId: string;
	value: number | null;
	unit: string | null;
	partId: string | null;
	partQuantity: number | null;
	rawText: string;
	note: string | null;
	retracts: string | null;
	occurredAt: Date;
	/** The grade as logged, normalised ("SAE 10W-30 · API SN · JASO MA2"). */
	fluid?: string | null;
}

export interface JobProcedureRow {
	id: string;
	name: string;
	flatRateHours: number;
}

export interface DraftLine {
	kind: LineKind;
	description: string;
	partId: string | null;
	quantity: number;
	unit: string;
	unitPriceMinor: number;
	unmatched: boolean;
	sourceEntryId: string | null;
	sourceStepId: string | null;
	/** For an unmatched line: price-list parts that come closest, best first. */
	suggestions: string[];
}

export interface DraftInput {
	parts: readonly PriceListPart[];
	steps: readonly JobStepRow[];
	entries: readonly LogRow[];
	procedures: readonly JobProcedureRow[];
	technicianNames: ReadonlyMap<string, string>;
	labourMode: LabourMode;
	labourRateMinor: number;
	idleGapMinutes: number;
}

/** Price-list units in UCUM, for the units module. */
const UCUM_OF: Record<PriceListPart['unit'], string | null> = { each: null, L: 'L', mL: 'mL' };

/** Fluid quantities are billed to the millilitre in litres, or to the whole millilitre. */
function roundQuantity(q: number, unit: PriceListPart['unit']): number {
	const places = unit === 'L' ? 3 : 0;
	const f = 10 ** places;
	return unit === 'each' ? q : Math.round(q * f) / f;
}

/**
 * The quantity of a fluid logged on a step, converted into the price-list unit:
 * 1.1 [qt_us] against a per-litre oil is 1.041 L (1.1 × 0.946352946 = 1.04098824 → 1.041).
 */
export function fluidQuantity(
	value: number,
	unit: string,
	partUnit: PriceListPart['unit']
): number | null {
	const target = UCUM_OF[partUnit];
	if (!target || !canConvert(unit, target)) return null;
	return roundQuantity(convert(value, unit, target), partUnit);
}

/** Short words that say nothing about which part it is. */
const NOISE = new Set([
	'new',
	'the',
	'and',
	'for',
	'with',
	'fitted',
	'fit',
	'replaced',
	'renewed',
	'part'
]);

/**
 * Fuzzy match by words: each word of the entry is looked up on its own (Fuse, typo-tolerant),
 * and parts are ranked by how many words they match, then by how well. Confident when at
 * least two words match (or the only word does).
 */
export function matchByWords(
	fuse: Fuse<PriceListPart>,
	text: string
): { part: PriceListPart; words: number; confident: boolean }[] {
	const words = text
		.toLowerCase()
		.split(/[^\p{L}\p{N}-]+/u)
		.filter((w, i, all) => w.length >= 2 && !NOISE.has(w) && all.indexOf(w) === i);
	const score = new Map<string, { part: PriceListPart; words: number; quality: number }>();
	for (const w of words) {
		for (const hit of fuse.search(w)) {
			const s = score.get(hit.item.id) ?? { part: hit.item, words: 0, quality: 0 };
			s.words++;
			s.quality += 1 - (hit.score ?? 1);
			score.set(hit.item.id, s);
		}
	}
	const need = Math.min(2, words.length);
	return [...score.values()]
		.sort((a, b) => b.words - a.words || b.quality - a.quality)
		.map((s) => ({ part: s.part, words: s.words, confident: need > 0 && s.words >= need }));
}

/** Work entries whose times count towards clock-time labour (decisions and sign-off do not). */
const WORK_KINDS = new Set(['measure', 'part', 'note', 'done', 'inspection']);
const STEP_DONE_KINDS = new Set(['measure', 'done', 'part']);

export function buildDraftLines(input: DraftInput): DraftLine[] {
	const partById = new Map(input.parts.map((p) => [p.id, p]));
	const active = input.parts.filter((p) => p.active);
	const fuse = new Fuse(active, {
		keys: ['description', 'code'],
		includeScore: true,
		ignoreLocation: true,
		threshold: 0.3
	});
	const live = liveEntries(input.entries);
	const lines: DraftLine[] = [];

	const partLine = (
		p: PriceListPart,
		quantity: number,
		src: { entry?: string | null; step?: string | null }
	): DraftLine => ({
		kind: p.unit === 'each' ? 'part' : 'fluid',
		description: `${p.description} (${p.code})`,
		partId: p.id,
		quantity,
		unit: p.unit,
		unitPriceMinor: p.priceMinor,
		unmatched: false,
		sourceEntryId: src.entry ?? null,
		sourceStepId: src.step ?? null,
		suggestions: []
	});

	/** A quantity for a part, preferring a logged volume converted into the part's unit. */
	function quantityFor(p: PriceListPart, logged: LogRow | undefined, fallback: number | null) {
		if (p.unit !== 'each' && logged && logged.value !== null && logged.unit) {
			const q = fluidQuantity(logged.value, logged.unit, p.unit);
			if (q !== null) return q;
		}
		return fallback ?? 1;
	}

	/**
	 * A fluid step whose grade was logged: the price-list fluid of that grade, its line naming
	 * the grade; when none (or several) match, an unmatched line that says so.
	 */
	function gradedLine(p: PriceListPart, step: JobStepRow, e: LogRow, grade: string): DraftLine {
		const pick = pickByGrade(
			grade,
			active.filter((x) => x.unit !== 'each')
		);
		if (pick.item) {
			const line = partLine(pick.item, quantityFor(pick.item, e, step.partQuantity), {
				entry: e.id,
				step: step.id
			});
			return { ...line, description: `${line.description} · ${grade}` };
		}
		return {
			kind: 'fluid',
			description: `${step.label}, ${grade}: ${pick.problem}`,
			partId: null,
			quantity: quantityFor(p, e, step.partQuantity),
			unit: p.unit,
			unitPriceMinor: 0,
			unmatched: true,
			sourceEntryId: e.id,
			sourceStepId: step.id,
			suggestions: pick.near.map((x) => x.id).slice(0, 3)
		};
	}

	// Steps with a billable part, done on this job (an entry that still counts).
	const steps = [...input.steps].sort((a, b) => a.position - b.position);
	for (const step of steps) {
		if (!step.partId) continue;
		const p = partById.get(step.partId);
		if (!p) continue;
		const onStep = live.filter((e) => e.jobStepId === step.id && STEP_DONE_KINDS.has(e.kind));
		if (onStep.length === 0) continue;
		// A part entry for this very part on the step is billed as that entry, not twice.
		if (onStep.some((e) => e.kind === 'part' && e.partId === step.partId)) continue;
		const measured = onStep.filter((e) => e.kind === 'measure').at(-1);
		if (p.unit !== 'each' && measured?.fluid) {
			lines.push(gradedLine(p, step, measured, measured.fluid));
			continue;
		}
		lines.push(partLine(p, quantityFor(p, measured, step.partQuantity), { step: step.id }));
	}

	// Part entries: by their price-list link, else by their words.
	for (const e of live) {
		if (e.kind !== 'part') continue;
		const linked = e.partId ? partById.get(e.partId) : undefined;
		if (linked) {
			lines.push(
				partLine(linked, quantityFor(linked, e, e.partQuantity), {
					entry: e.id,
					step: e.jobStepId
				})
			);
			continue;
		}
		const words = (e.note || e.rawText).trim();
		const ranked = matchByWords(fuse, words);
		const best = ranked[0];
		if (best && best.confident) {
			lines.push(
				partLine(best.part, quantityFor(best.part, e, e.partQuantity), {
					entry: e.id,
					step: e.jobStepId
				})
			);
		} else {
			lines.push({
				kind: 'part',
				description: words || 'Part from the log',
				partId: null,
				quantity: e.partQuantity ?? 1,
				unit: 'each',
				unitPriceMinor: 0,
				unmatched: true,
				sourceEntryId: e.id,
				sourceStepId: e.jobStepId,
				suggestions: ranked.slice(0, 3).map((r) => r.part.id)
			});
		}
	}

	// Labour.
	if (input.labourMode === 'flat_rate') {
		for (const proc of input.procedures) {
			if (!(proc.flatRateHours > 0)) continue;
			lines.push({
				kind: 'labour',
				description: `Labour, flat rate: ${proc.name}`,
				partId: null,
				quantity: proc.flatRateHours,
				unit: 'h',
				unitPriceMinor: input.labourRateMinor,
				unmatched: false,
				sourceEntryId: null,
				sourceStepId: null,
				suggestions: []
			});
		}
	} else {
		const worked = clockTime(
			live.filter((e) => WORK_KINDS.has(e.kind)),
			input.idleGapMinutes
		);
		for (const w of worked) {
			if (w.hours <= 0) continue;
			const name = input.technicianNames.get(w.authorId) ?? 'Technician';
			lines.push({
				kind: 'labour',
				description: `Labour, clock time: ${name}`,
				partId: null,
				quantity: w.hours,
				unit: 'h',
				unitPriceMinor: input.labourRateMinor,
				unmatched: false,
				sourceEntryId: null,
				sourceStepId: null,
				suggestions: []
			});
		}
	}
	return lines;
}
