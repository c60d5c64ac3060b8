import { describe, expect, it } from 'vitest';
import { entryPostSchema } from './bench';
import { extraWorkSchema } from './job';
import { inWindow, readDate } from './dates';
import { toolSchema } from './shop';

// The values an attacker and a careless typist tried: each is refused with words.
const wild = ['99999-01-01', '0000-01-01', '+275760-09-13T00:00:00Z', '0001-01-01T00:00:00Z'];

describe('dates in a sane window', () => {
	it('reads four-digit years only, and nothing JavaScript would guess at', () => {
		expect(readDate('2026-12-04T10:30')?.toISOString()).toMatch(/^2026-12-04T/);
		expect(readDate('+275760-09-13T00:00:00Z')).toBeNull();
		expect(readDate('99999-01-01')).toBeNull();
		expect(readDate('12/04/26')).toBeNull();
		// "0001" is a valid four-digit year for readDate, but outside the window.
		expect(inWindow(readDate('0001-01-01T00:00:00Z')!)).toBe(false);
		expect(readDate('0001-01-01T00:00:00Z')?.getUTCFullYear()).toBe(1);
	});

	it("refuses them as an entry's device time", () => {
		for (const occurredAt of wild) {
			const r = entryPostSchema.safeParse({
				id: crypto.randomUUID(),
				text: 'rear axle 88 nm',
				source: 'typed',
				occurredAt
			});
			expect(r.success, occurredAt).toBe(false);
		}
	});

	it('refuses them as a calibration date', () => {
		for (const calibratedOn of ['0000-01-01', '1899-12-31', '2999-01-01']) {
			const r = toolSchema.safeParse({
				identifier: 'TW-1',
				kind: 'click wrench',
				rangeMin: '5',
				rangeMax: '60',
				unit: 'N.m',
				calibratedOn
			});
			expect(r.success, calibratedOn).toBe(false);
		}
	});
});

describe('approval times', () => {
	it('refuses years outside the window with words', () => {
		for (const approvedAt of wild) {
			const r = extraWorkSchema.safeParse({
				procedureId: crypto.randomUUID(),
				description: 'Chain and sprockets',
				approvedBy: 'Demo customer',
				channel: 'phone',
				approvedAt
			});
			expect(r.success, approvedAt).toBe(false);
		}
	});
});
