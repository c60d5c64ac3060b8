import { describe, expect, it } from 'vitest';
import { settingsSchema } from './shop';

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
