/** The phrase engine's shapes: a step as the engine reads it, the context and the result. */
import type { Adapter } from '../torque/adapter';
import type { FluidVerdict } from './fluid';

export type { FluidVerdict } from './fluid';

export interface StepSpec {
	id: string;
	label: string;
	aliases?: string[];
	unit?: string;
	nominal?: number;
	min?: number;
	max?: number;
	done?: boolean;
	/** The fluid spec as the manual writes it: "SAE 10W-30, API SJ or higher, JASO MA", "DOT 4". */
	fluid?: string;
}

export interface PhraseContext {
	steps: StepSpec[];
	now?: Date;
	/** IANA zone of the shop, e.g. 'Europe/Berlin'; defaults to the runtime's zone. */
	timeZone?: string;
	/** Shop policy band for a spec that gives only a nominal value, in percent (default 10). */
	tolerancePct?: number;
}

export type Intent =
	'measure' | 'part' | 'note' | 'next' | 'spec' | 'history' | 'done' | 'undo' | 'unknown';
export type Verdict = 'in' | 'low' | 'high' | 'no_spec';

/** The limits a value was judged against, in the step's unit. */
export interface SpecBand {
	min: number | null;
	max: number | null;
	/** 'spec': the step's own min/max; 'shop_tolerance': nominal ± tolerancePct. */
	source: 'spec' | 'shop_tolerance';
}

export interface ParsedPhrase {
	intent: Intent;
	/** The matched step. */
	stepId: string | null;
	/** Best first (score 0..1, higher is better). */
	candidates: { stepId: string; score: number }[];
	/** As called out, UCUM unit ('1' when neither the phrase nor the step has one). */
	quantity: { value: number; unit: string } | null;
	/** Converted into the step's unit. */
	specValue: { value: number; unit: string } | null;
	verdict: Verdict | null;
	/** ISO 8601 when the phrase names a time. */
	occurredAt: string | null;
	/** The note's text for 'note'; what was fitted for 'part'. */
	note: string | null;
	/** Clear, human messages. */
	problems: string[];
	/** True when no unit was said and the step's own unit was assumed. */
	unitAssumed: boolean;
	/** The band behind the verdict, or null when there is no verdict or no spec. */
	band: SpecBand | null;
	/** The fluid grade as called out, normalised ("SAE 10W-30 · API SN · JASO MA2"), or null. */
	fluid: string | null;
	/**
	 * The grade against the step's fluid spec: null when the step has none; 'not_stated' when
	 * no grade was said; 'fails' when any stated part fails it; 'meets' when every one meets it.
	 */
	fluidVerdict: FluidVerdict | null;
	/** An adapter on the torque wrench, as said ("adapter 50 mm", "crowfoot at 90"), or null. */
	adapter: Adapter | null;
}

export interface PhraseParser {
	readonly steps: StepSpec[];
	parse(text: string, ctx?: Omit<PhraseContext, 'steps'>): ParsedPhrase;
}

/** A result with nothing read yet: intent 'unknown', no step, no value, no problem. */
export function emptyResult(): ParsedPhrase {
	return {
		intent: 'unknown',
		stepId: null,
		candidates: [],
		quantity: null,
		specValue: null,
		verdict: null,
		occurredAt: null,
		note: null,
		problems: [],
		unitAssumed: false,
		band: null,
		fluid: null,
		fluidVerdict: null,
		adapter: null
	};
}
