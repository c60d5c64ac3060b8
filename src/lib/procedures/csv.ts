// CSV import of a spec table: one row per step, grouped into procedures by the procedure
// column. Every row's problems are listed (row and column) before anything is saved.
import Papa from 'papaparse';
import { procedureFileEntry, type ProcedureFileEntry } from '$lib/schemas/procedure';
import { isKnownUnit, unitFromWords, UNITS } from '$lib/units';

export const csvColumns = [
	'procedure',
	'applies_to',
	'flat_rate_hours',
	'step',
	'aliases',
	'unit',
	'nominal',
	'min',
	'max',
	'tolerance',
	'caution',
	'fluid',
	'adapter_mm',
	'adapter_direction',
	'part_code',
	'part_quantity'
] as const;
type Column = (typeof csvColumns)[number];

export interface CsvProblem {
	/** The file's line number (the header is line 1). */
	row: number;
	column: Column | null;
	message: string;
}

export interface CsvPreviewRow {
	row: number;
	procedure: string;
	step: string;
	unit: string | null;
	nominal: number | null;
	min: number | null;
	max: number | null;
	partCode: string | null;
	partQuantity: number | null;
	problems: CsvProblem[];
}

export interface CsvResult {
	rows: CsvPreviewRow[];
	/** Problems not tied to one row (a missing column, an empty file). */
	fileProblems: CsvProblem[];
	procedures: ProcedureFileEntry[];
	ok: boolean;
}

/** A unit as written in a spec table: a UCUM code, the trade's symbol, or words ("Nm"). */
export function readUnit(raw: string): string | null {
	const t = raw.trim();
	if (!t) return null;
	if (isKnownUnit(t)) return t;
	const bySymbol = UNITS.find((u) => u.symbol === t || u.symbol.replace('·', '') === t);
	if (bySymbol) return bySymbol.code;
	return unitFromWords(t);
}

function readNumber(raw: string): number | null | 'bad' {
	const t = raw.trim().replace(',', '.');
	if (!t) return null;
	const n = Number(t);
	return Number.isFinite(n) ? n : 'bad';
}

/** Parses and checks a spec table. Pure; the server adds price-list checks and saves. */
export function readSpecCsv(text: string): CsvResult {
	const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ''), {
		header: true,
		skipEmptyLines: 'greedy',
		transformHeader: (h) => h.trim().toLowerCase().replace(/\s+/g, '_')
	});
	const fileProblems: CsvProblem[] = [];
	const headers = parsed.meta.fields ?? [];
	for (const required of ['procedure', 'step'] as const) {
		if (!headers.includes(required)) {
			fileProblems.push({
				row: 1,
				column: required,
				message: `The header has no '${required}' column.`
			});
		}
	}
	const unknown = headers.filter((h) => h && !(csvColumns as readonly string[]).includes(h));
	if (unknown.length) {
		fileProblems.push({
			row: 1,
			column: null,
			message: `Unknown column${unknown.length > 1 ? 's' : ''}: ${unknown.join(', ')}. Known: ${csvColumns.join(', ')}.`
		});
	}
	if (parsed.data.length === 0)
		fileProblems.push({ row: 1, column: null, message: 'The file has no rows.' });
	if (fileProblems.length) return { rows: [], fileProblems, procedures: [], ok: false };

	const rows: CsvPreviewRow[] = [];
	const groups = new Map<string, { entry: Record<string, unknown>; rows: CsvPreviewRow[] }>();
	for (const err of parsed.errors) {
		if (err.row !== undefined) {
			fileProblems.push({ row: err.row + 2, column: null, message: err.message });
		}
	}

	parsed.data.forEach((record, i) => {
		const row = i + 2;
		const get = (c: Column) => (record[c] ?? '').trim();
		const problems: CsvProblem[] = [];
		const problem = (column: Column, message: string) => problems.push({ row, column, message });
		const numberOf = (c: Column): number | null => {
			const v = readNumber(get(c));
			if (v === 'bad') {
				problem(c, `'${get(c)}' is not a number.`);
				return null;
			}
			return v;
		};
		const procedure = get('procedure');
		const step = get('step');
		if (!procedure) problem('procedure', 'Name the procedure.');
		if (!step) problem('step', 'Name the step.');
		let unit: string | null = null;
		if (get('unit')) {
			unit = readUnit(get('unit'));
			if (!unit) problem('unit', `Benchcall does not know the unit '${get('unit')}'.`);
		}
		const nominal = numberOf('nominal');
		const min = numberOf('min');
		const max = numberOf('max');
		const tolerance = numberOf('tolerance');
		const hours = numberOf('flat_rate_hours');
		const partQuantity = numberOf('part_quantity');
		const partCode = get('part_code') || null;
		// the adapter's length and direction; the file's checks name the one missing
		const adapterMm = numberOf('adapter_mm');
		const adapter =
			get('adapter_mm') || get('adapter_direction')
				? { lengthMm: adapterMm, direction: get('adapter_direction').toLowerCase() || undefined }
				: null;
		if (partCode && partQuantity === null && !problems.some((p) => p.column === 'part_quantity')) {
			problem('part_quantity', 'Give the quantity billed for the part.');
		}
		const stepObject = {
			label: step,
			aliases: get('aliases')
				.split(/[;|]/)
				.map((a) => a.trim())
				.filter(Boolean),
			unit,
			nominal,
			min,
			max,
			caution: get('caution') || null,
			fluid: get('fluid') || null,
			adapter,
			part: partCode ? { code: partCode, quantity: partQuantity ?? 0 } : null,
			...(tolerance !== null ? { plusMinus: tolerance } : {})
		};
		// The same checks as the procedure file, so both imports agree.
		let finalStep: Record<string, unknown> = stepObject;
		if (tolerance !== null) {
			if (min !== null || max !== null) {
				problem('tolerance', 'Give either min and max or a tolerance, not both.');
			} else if (nominal === null) {
				problem('tolerance', 'A tolerance needs a nominal value.');
			} else if (tolerance <= 0) {
				problem('tolerance', 'The tolerance must be more than 0.');
			} else {
				finalStep = {
					...stepObject,
					min: Number.parseFloat((nominal - tolerance).toPrecision(12)),
					max: Number.parseFloat((nominal + tolerance).toPrecision(12))
				};
			}
			delete finalStep.plusMinus;
		}
		const preview: CsvPreviewRow = {
			row,
			procedure,
			step,
			unit,
			nominal,
			min: finalStep.min as number | null,
			max: finalStep.max as number | null,
			partCode,
			partQuantity,
			problems
		};
		rows.push(preview);
		if (!procedure) return;
		let group = groups.get(procedure);
		if (!group) {
			group = { entry: { name: procedure, appliesTo: '', flatRateHours: 0, steps: [] }, rows: [] };
			groups.set(procedure, group);
		}
		if (get('applies_to') && !group.entry.appliesTo) group.entry.appliesTo = get('applies_to');
		if (hours !== null && !group.entry.flatRateHours) group.entry.flatRateHours = hours;
		(group.entry.steps as unknown[]).push(finalStep);
		group.rows.push(preview);
	});

	const columnOf = (path: PropertyKey[]): Column | null => {
		const key = String(path[path.length - 1]);
		const map: Record<string, Column> = {
			label: 'step',
			unit: 'unit',
			nominal: 'nominal',
			min: 'min',
			max: 'max',
			caution: 'caution',
			fluid: 'fluid',
			lengthMm: 'adapter_mm',
			direction: 'adapter_direction',
			code: 'part_code',
			quantity: 'part_quantity',
			aliases: 'aliases',
			name: 'procedure',
			appliesTo: 'applies_to',
			flatRateHours: 'flat_rate_hours'
		};
		if (typeof path[path.length - 1] === 'number' && path[path.length - 2] === 'aliases') {
			return 'aliases';
		}
		return map[key] ?? null;
	};

	const procedures: ProcedureFileEntry[] = [];
	for (const group of groups.values()) {
		const r = procedureFileEntry.safeParse(group.entry);
		if (r.success) {
			procedures.push(r.data);
			continue;
		}
		for (const issue of r.error.issues) {
			const stepIndex = issue.path[0] === 'steps' ? Number(issue.path[1]) : null;
			const target = stepIndex !== null ? group.rows[stepIndex] : group.rows[0];
			const column = columnOf(issue.path);
			// The row's own checks already said this (e.g. a bad number): don't repeat it.
			if (column && target.problems.some((p) => p.column === column)) continue;
			target.problems.push({ row: target.row, column, message: issue.message });
		}
	}
	const ok = fileProblems.length === 0 && rows.every((r) => r.problems.length === 0);
	return { rows, fileProblems, procedures: ok ? procedures : [], ok };
}
