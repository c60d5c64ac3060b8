// The invoice lines as CSV (RFC 4180: comma-separated, CRLF, fields quoted when needed). Pure.
import { toDecimalString } from '$lib/money';

export interface CsvLine {
	position: number;
	kind: string;
	description: string;
	quantity: number;
	unit: string;
	unitPriceMinor: number;
	amountMinor: number;
	taxRateBp: number;
	taxMinor: number;
}

function field(v: string | number, text = false): string {
	const s = String(v);
	// Text starting with =, +, - or @ would be read as a formula by spreadsheets: prefix a quote.
	const safe = text && /^[=+\-@]/.test(s) ? `'${s}` : s;
	return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

export function linesCsv(lines: readonly CsvLine[], currency: string): string {
	const head = [
		'position',
		'kind',
		'description',
		'quantity',
		'unit',
		`unit_price_${currency}`,
		`amount_${currency}`,
		'tax_rate_percent',
		`tax_${currency}`
	];
	const rows = lines.map((l) =>
		[
			l.position,
			l.kind,
			l.description,
			l.quantity,
			l.unit,
			toDecimalString(l.unitPriceMinor, currency),
			toDecimalString(l.amountMinor, currency),
			(l.taxRateBp / 100).toString(),
			toDecimalString(l.taxMinor, currency)
		]
			.map((v, i) => field(v, i === 1 || i === 2 || i === 4))
			.join(',')
	);
	return [head.join(','), ...rows].join('\r\n') + '\r\n';
}
