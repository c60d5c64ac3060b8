/**
 * A torque wrench with an adapter (a crowfoot, an offset or an extension) on its drive: the
 * adapter moves the point where the torque is applied, so the wrench must be set to
 *
 *     setting = T × L / (L + E)
 *
 * where T is the torque wanted at the fastener, L the wrench's effective length (from the
 * centre of its drive to the centre of its handle's load mark) and E the adapter's length
 * along the wrench's axis. E is signed: positive when the adapter points away from the hand
 * (the lever grows), negative when it points back towards the hand (L − E), and zero for a
 * crowfoot turned at 90° to the wrench, which adds no length along the lever and needs no
 * correction. Pure; never throws (see `wrenchSetting`).
 */
import { canConvert, convert, formatNumber, formatQuantity } from '../units';

/** An adapter as stated: its length in mm and how it sits on the wrench. */
export interface Adapter {
	/** Length from the wrench's drive to the fastener's centre, in mm (always ≥ 0). */
	lengthMm: number;
	/** 'out': along the wrench, away from the hand; 'back': towards the hand; 'square': at 90°. */
	direction: 'out' | 'back' | 'square';
}

export const ADAPTER_DIRECTIONS = ['out', 'back', 'square'] as const;
export type AdapterDirection = (typeof ADAPTER_DIRECTIONS)[number];

/** Longest adapter Benchcall takes (a metre); the database refuses more (drizzle/0014). */
export const MAX_ADAPTER_MM = 1000;

/**
 * A step's adapter from its two stored fields, or null when it has none (or they do not make
 * one: a length without a direction, a direction without a length).
 */
export function stepAdapter(
	lengthMm: number | null | undefined,
	direction: string | null | undefined
): Adapter | null {
	if (typeof lengthMm !== 'number' || !Number.isFinite(lengthMm)) return null;
	if (lengthMm < 0 || lengthMm > MAX_ADAPTER_MM) return null;
	if (!ADAPTER_DIRECTIONS.includes(direction as AdapterDirection)) return null;
	return { lengthMm, direction: direction as AdapterDirection };
}

/** Where the adapter of a torque entry came from. */
export type AdapterSource = 'said' | 'picked' | 'step';

/**
 * The adapter a torque entry is made with: one said in the phrase, else one picked on the
 * Bench, else the step's own (the procedure says the step is done with it). Null when none.
 */
export function adapterInUse(
	said: Adapter | null | undefined,
	picked: Adapter | null | undefined,
	step: Adapter | null | undefined
): { adapter: Adapter; from: AdapterSource } | null {
	if (said) return { adapter: said, from: 'said' };
	if (picked) return { adapter: picked, from: 'picked' };
	if (step) return { adapter: step, from: 'step' };
	return null;
}

/** E for the formula: signed length along the lever, in mm. */
export function signedLength(a: Adapter): number {
	if (a.direction === 'square') return 0;
	return a.direction === 'back' ? -a.lengthMm : a.lengthMm;
}

export interface WrenchSetting {
	/** What to set on the wrench, in the target's unit; null when it cannot be worked out. */
	setting: number | null;
	/** Why not, in words for the screen. */
	problem: string | null;
}

/**
 * What to set on the wrench for `target` at the fastener with an adapter on a wrench of
 * effective length `toolLengthMm`. A missing or unusable length is a problem in words.
 */
export function wrenchSetting(
	target: number,
	toolLengthMm: number | null | undefined,
	adapter: Adapter
): WrenchSetting {
	if (!Number.isFinite(target) || target <= 0) {
		return { setting: null, problem: 'A setting needs a torque above zero.' };
	}
	if (!Number.isFinite(adapter.lengthMm) || adapter.lengthMm < 0) {
		return { setting: null, problem: 'The adapter’s length must be zero or more.' };
	}
	const e = signedLength(adapter);
	if (e === 0) return { setting: target, problem: null };
	if (toolLengthMm === null || toolLengthMm === undefined) {
		return {
			setting: null,
			problem: 'Pick the torque tool in use (with its effective length) to work out the setting.'
		};
	}
	if (!Number.isFinite(toolLengthMm) || toolLengthMm <= 0) {
		return { setting: null, problem: 'The torque tool’s effective length must be above zero.' };
	}
	// An adapter pointing back as long as the lever (or longer) leaves no lever at all.
	if (toolLengthMm + e <= 0) {
		return {
			setting: null,
			problem: 'An adapter pointing back must be shorter than the wrench’s effective length.'
		};
	}
	return { setting: (target * toolLengthMm) / (toolLengthMm + e), problem: null };
}

/**
 * The setting in the tool's own unit as well (a wrench scaled in lbf·ft for an N·m spec);
 * null when the units do not convert.
 */
export function inToolUnit(setting: number, unit: string, toolUnit: string): number | null {
	if (unit === toolUnit) return setting;
	return canConvert(unit, toolUnit) ? convert(setting, unit, toolUnit) : null;
}

/** The adapter from its stored signed length (mm along the lever). */
export function adapterFromMm(mm: number): Adapter {
	if (mm === 0) return { lengthMm: 0, direction: 'square' };
	return { lengthMm: Math.abs(mm), direction: mm < 0 ? 'back' : 'out' };
}

/**
 * The adapter in words: "adapter 50 mm", "adapter 50 mm pointing back", "crowfoot 45 mm at 90°"
 * ("crowfoot at 90°" when its length was not given).
 */
export function adapterWords(a: Adapter): string {
	const len = `${formatNumber(a.lengthMm, { maxDecimals: 1 })} mm`;
	if (a.direction === 'square')
		return a.lengthMm > 0 ? `crowfoot ${len} at 90°` : 'crowfoot at 90°';
	return a.direction === 'back' ? `adapter ${len} pointing back` : `adapter ${len}`;
}

/** A logged entry's adapter and setting, for the job log: "adapter 50 mm · set 73.3 N·m". */
export function adapterLine(
	adapterMm: number,
	setting: number | null,
	settingUnit: string | null
): string {
	const a = adapterFromMm(adapterMm);
	if (a.direction === 'square') return `${adapterWords(a)} · no correction`;
	const set =
		setting !== null && settingUnit
			? `set ${formatQuantity(setting, settingUnit, { maxDecimals: 1 })}`
			: 'setting not worked out (no tool length)';
	return `${adapterWords(a)} · ${set}`;
}

export interface AdapterPreview {
	/** "adapter 50 mm", "crowfoot at 90°". */
	words: string;
	/** The torque wanted at the fastener, in the step's unit (said, else the spec's). */
	target: number | null;
	/** Where the target came from. */
	from: 'said' | 'spec' | null;
	setting: number | null;
	/** The setting in the tool's unit when it differs from the step's. */
	inTool: { value: number; unit: string } | null;
	problem: string | null;
}

/**
 * What the call bar shows for an adapter: the setting for the torque said, or for the step's
 * spec (its nominal, else the middle of its band) when no torque was said yet.
 */
export function adapterPreview(
	adapter: Adapter,
	said: { value: number; unit: string } | null,
	step: { unit: string | null; nominal: number | null; min: number | null; max: number | null },
	tool: { effectiveLengthMm: number | null; unit: string } | null
): AdapterPreview {
	const words = adapterWords(adapter);
	const unit = step.unit;
	let target: number | null = null;
	let from: AdapterPreview['from'] = null;
	if (said && said.unit === unit) {
		target = said.value;
		from = 'said';
	} else if (step.nominal !== null) {
		target = step.nominal;
		from = 'spec';
	} else if (step.min !== null && step.max !== null) {
		target = (step.min + step.max) / 2;
		from = 'spec';
	}
	if (target === null || !unit) {
		return {
			words,
			target,
			from,
			setting: null,
			inTool: null,
			problem: 'Say the torque to work out the setting.'
		};
	}
	const r = wrenchSetting(target, tool?.effectiveLengthMm, adapter);
	const other =
		r.setting !== null && tool && tool.unit !== unit
			? inToolUnit(r.setting, unit, tool.unit)
			: null;
	return {
		words,
		target,
		from,
		setting: r.setting,
		inTool: other === null || !tool ? null : { value: other, unit: tool.unit },
		problem: r.problem
	};
}
