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
import { canConvert, convert } from '../units';

/** An adapter as stated: its length in mm and how it sits on the wrench. */
export interface Adapter {
	/** Length from the wrench's drive to the fastener's centre, in mm (always ≥ 0). */
	lengthMm: number;
	/** 'out': along the wrench, away from the hand; 'back': towards the hand; 'square': at 90°. */
	direction: 'out' | 'back' | 'square';
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
