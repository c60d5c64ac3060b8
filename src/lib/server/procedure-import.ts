// Reads an uploaded procedure file (Benchcall JSON) or spec table (CSV) into a preview with
// every problem located; saving goes through importProcedures (one transaction).
import { readSpecCsv, type CsvPreviewRow } from '$lib/procedures/csv';
import { readProcedureFile, type ProcedureFileEntry, type Problem } from '$lib/schemas/procedure';
import { listParts } from './price-list';
import { importProcedures, importRefused, type ImportResult } from './procedures';

export interface ImportPreview {
	kind: 'json' | 'csv';
	ok: boolean;
	problems: Problem[];
	rows: CsvPreviewRow[];
	procedures: { name: string; steps: number }[];
}

function read(kind: 'json' | 'csv', content: string) {
	if (kind === 'json') {
		const r = readProcedureFile(content);
		return r.ok
			? { entries: r.file.procedures, problems: [], rows: [] as CsvPreviewRow[] }
			: { entries: [] as ProcedureFileEntry[], problems: r.problems, rows: [] as CsvPreviewRow[] };
	}
	const r = readSpecCsv(content);
	const problems: Problem[] = [
		...r.fileProblems.map((p) => ({
			where: `row ${p.row}${p.column ? `, column ${p.column}` : ''}`,
			message: p.message
		})),
		...r.rows.flatMap((row) =>
			row.problems.map((p) => ({
				where: `row ${p.row}${p.column ? `, column ${p.column}` : ''}`,
				message: p.message
			}))
		)
	];
	return { entries: r.procedures, problems, rows: r.rows };
}

/** Where a CSV step came from, for part-code problems found against the price list. */
function csvWhere(rows: CsvPreviewRow[], entries: ProcedureFileEntry[]) {
	return (p: number, s: number) => {
		const name = entries[p].name;
		const row = rows.filter((r) => r.procedure === name)[s];
		return row ? `row ${row.row}, column part_code` : `procedure ${name}`;
	};
}

export async function previewImport(
	shopId: string,
	kind: 'json' | 'csv',
	content: string
): Promise<ImportPreview> {
	const { entries, problems, rows } = read(kind, content);
	if (!problems.length) {
		const codes = new Set((await listParts(shopId)).map((p) => p.code));
		const where =
			kind === 'csv'
				? csvWhere(rows, entries)
				: (p: number, s: number) => `procedures[${p}].steps[${s}].part.code`;
		entries.forEach((e, p) =>
			e.steps.forEach((s, i) => {
				if (s.part && !codes.has(s.part.code)) {
					problems.push({
						where: where(p, i),
						message: `The part code '${s.part.code}' is not on the price list.`
					});
				}
			})
		);
	}
	return {
		kind,
		ok: problems.length === 0,
		problems,
		rows,
		procedures: entries.map((e) => ({ name: e.name, steps: e.steps.length }))
	};
}

export async function saveImport(
	shopId: string,
	kind: 'json' | 'csv',
	content: string
): Promise<ImportResult> {
	const { entries, problems, rows } = read(kind, content);
	if (problems.length) return importRefused('invalid', problems);
	return importProcedures(shopId, entries, kind === 'csv' ? csvWhere(rows, entries) : undefined);
}

/** json or csv from the file name, else from the first character. */
export function kindOf(fileName: string, content: string): 'json' | 'csv' {
	if (/\.json$/i.test(fileName)) return 'json';
	if (/\.(csv|txt)$/i.test(fileName)) return 'csv';
	return content.trimStart().startsWith('{') ? 'json' : 'csv';
}
