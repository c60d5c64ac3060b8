import { describe, expect, it } from 'vitest';
import { partSchema, settingsSchema, toolSchema } from './shop';

const base = {
	currency: 'EUR',
	labourRate: '72.00',
	taxRatePct: '20',
	defaultTolerancePct: '10',
	idleGapMinutes: '30',
	calibrationMonths: '12',
	bays: 'Bay 1'
};

describe('settingsSchema: the shop’s date and number style', () => {
	it('tidies a language tag and a time zone Intl knows', () => {
		const r = settingsSchema.safeParse({ ...base, locale: ' de-de ', timeZone: 'Europe/Berlin' });
		expect(r.success && r.data.locale).toBe('de-DE');
		expect(r.success && r.data.timeZone).toBe('Europe/Berlin');
	});

	it('refuses an unknown tag or zone with words, and leaves both alone when not sent', () => {
		const r = settingsSchema.safeParse({ ...base, locale: 'english!', timeZone: 'Moon/Base' });
		expect(r.success).toBe(false);
		const said = r.error?.issues.map((i) => `${i.path.join('.')}: ${i.message}`) ?? [];
		expect(said).toContain('locale: Use a language tag such as en-GB or de-DE.');
		expect(said).toContain('timeZone: Use a time zone such as Europe/London.');
		const kept = settingsSchema.safeParse(base);
		expect(kept.success && kept.data.locale).toBeUndefined();
	});
});

const part = { code: 'OIL-1040', description: 'Engine oil (demo)', unit: 'L', priceMinor: '1490' };
const tool = {
	identifier: 'TW-9',
	kind: 'Type II class A click',
	rangeMin: '40',
	rangeMax: '200',
	unit: 'N.m'
};

describe('price-list fluids with their grade', () => {
	it('keeps the grade normalised, as the log writes it', () => {
		// "SAE 10W-30, API SJ, JASO MA" is a valid J300/API/JASO triple (common practice)
		const r = partSchema.safeParse({ ...part, fluid: 'SAE 10W-30, API SJ, JASO MA' });
		expect(r.data?.fluid).toBe('SAE 10W-30 · API SJ · JASO MA');
		expect(partSchema.safeParse({ ...part, fluid: 'dot 4' }).data?.fluid).toBe('DOT 4');
		expect(partSchema.safeParse(part).data?.fluid).toBeNull();
	});

	it('refuses a grade that is not one, two grades, or a grade on a part sold each', () => {
		// SAE J300 has no 15W-35; FMVSS 116 no DOT 6
		for (const fluid of ['SAE 15W-35', 'DOT 6', 'SAE 10W-30 or 10W-40']) {
			const r = partSchema.safeParse({ ...part, fluid });
			expect(r.success).toBe(false);
			expect(r.error?.issues[0]?.path).toEqual(['fluid']);
		}
		const each = partSchema.safeParse({ ...part, unit: 'each', fluid: 'DOT 4' });
		expect(each.error?.issues[0]?.message).toMatch(/litre or millilitre/);
	});
});

describe('a torque tool’s effective length', () => {
	it('is optional, in mm, above 0 and at most 3 m', () => {
		expect(toolSchema.safeParse(tool).data?.effectiveLengthMm).toBeNull();
		expect(
			toolSchema.safeParse({ ...tool, effectiveLengthMm: '412,5' }).data?.effectiveLengthMm
		).toBe(412.5);
		for (const bad of ['0', '-3', '4000', 'long']) {
			expect(toolSchema.safeParse({ ...tool, effectiveLengthMm: bad }).success).toBe(false);
		}
		expect(toolSchema.safeParse({ ...tool, intervalMonths: '6' }).data?.intervalMonths).toBe(6);
		expect(toolSchema.safeParse({ ...tool, intervalMonths: '1.5' }).success).toBe(false);
	});
});
