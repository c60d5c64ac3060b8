/**
 * Billing a fluid by the grade that was logged: the price-list item whose grade states every
 * part of the logged grade the same way (SAE viscosity grade, API category, JASO class, DOT
 * class). No match, or more than one, is said in words for the service writer; Benchcall never
 * bills a grade other than the one poured. Pure; never throws.
 */
import { formatGrade, parseFluidSpec, type Grade } from '$lib/oil/fluid';

export interface GradedItem {
	id: string;
	/** The item's grade as the price list writes it; null for an item without one. */
	fluid?: string | null;
}

export type GradePick<T> = { item: T; problem: null } | { item: null; problem: string; near: T[] };

function grade(text: string | null): Grade | null {
	const g = parseFluidSpec(text);
	return g && g.problems.length === 0 ? g : null;
}

/** How many parts of `logged` the item states the same way; -1 when one differs or is missing. */
function agreement(logged: Grade, item: Grade): number {
	let n = 0;
	const parts: [string | null, string | null][] = [
		[logged.sae[0] ?? null, item.sae.length === 1 ? (item.sae[0] ?? null) : null],
		[logged.api, item.api],
		[logged.jaso, item.jaso],
		[logged.dot, item.dot]
	];
	for (const [want, has] of parts) {
		if (want === null) continue;
		if (want !== has) return -1;
		n++;
	}
	return n;
}

/** The price-list item for a logged grade, or why there is none. */
export function pickByGrade<T extends GradedItem>(
	logged: string,
	items: readonly T[]
): GradePick<T> {
	const want = grade(logged);
	if (!want) {
		return { item: null, problem: `The logged grade “${logged}” cannot be read.`, near: [] };
	}
	const text = formatGrade(want);
	const graded = items
		.map((it) => ({ it, g: grade(it.fluid ?? null) }))
		.filter((x) => x.g !== null);
	const hits = graded.filter((x) => agreement(want, x.g as Grade) > 0).map((x) => x.it);
	if (hits.length === 1 && hits[0]) return { item: hits[0], problem: null };
	// near: items with the same viscosity grade or brake fluid class, for the writer to choose
	const near = graded
		.filter((x) =>
			want.dot ? x.g?.dot === want.dot : want.sae[0] !== undefined && x.g?.sae.includes(want.sae[0])
		)
		.map((x) => x.it);
	if (hits.length > 1) {
		return {
			item: null,
			problem: `${hits.length} price-list fluids match ${text}: pick the one that was used.`,
			near: hits
		};
	}
	return {
		item: null,
		problem: `No price-list fluid has the grade ${text}: add it to the price list or pick the item by hand.`,
		near
	};
}
