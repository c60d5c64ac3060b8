// Words for the work report. Pure.
import { formatNumber, formatQuantity, unitSymbol } from '$lib/units';

export interface SpecBand {
	unit: string | null;
	nominal: number | null;
	min: number | null;
	max: number | null;
}

/** A step's spec as the report prints it: "22–26 N·m (24)", "≥ 1.0 L", "no spec". */
export function specText(s: SpecBand): string {
	if (!s.unit) return 'no value (check only)';
	const u = unitSymbol(s.unit);
	const nominal = s.nominal !== null ? ` (nominal ${formatNumber(s.nominal)})` : '';
	if (s.min !== null && s.max !== null) {
		return `${formatNumber(s.min)}–${formatNumber(s.max)} ${u}${nominal}`;
	}
	if (s.min !== null) return `at least ${formatQuantity(s.min, s.unit)}${nominal}`;
	if (s.max !== null) return `at most ${formatQuantity(s.max, s.unit)}${nominal}`;
	if (s.nominal !== null) return `${formatQuantity(s.nominal, s.unit)} nominal`;
	return 'no spec';
}

export const verdictWords: Record<string, string> = {
	in: 'in spec',
	low: 'under',
	high: 'over',
	no_spec: 'no spec'
};

export const entryKindWords: Record<string, string> = {
	measure: 'measured',
	part: 'part fitted',
	note: 'note',
	done: 'done',
	retraction: 'retraction',
	accept: 'foreman accepted',
	redo: 'foreman ordered a redo',
	inspection: 'final inspection',
	sign_off: 'signed off'
};
