/**
 * Units of measurement for Benchcall: UCUM codes as stored, exact conversion, the words people
 * use for units, and the trade's symbols for display. Pure TypeScript, no framework imports.
 */
export { convert, canConvert, dimensionOf, isKnownUnit, unitInfo } from './convert';
export { unitFromWords, normalizeUnitText, MAX_UNIT_WORDS } from './words';
export { formatNumber, formatQuantity, unitSymbol, type FormatOptions } from './format';
export { UNITS, DIMENSIONS, type Dimension, type UnitInfo } from './table';

import { UNITS, type Dimension, type UnitInfo } from './table';

/** The units of one kind, common ones first: what the procedure editor's picker offers. */
export function unitsOfDimension(dimension: Dimension): UnitInfo[] {
	return UNITS.filter((u) => u.dimension === dimension);
}
