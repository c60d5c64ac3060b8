import { describe, expect, it } from 'vitest';
import { decide, maxFailuresPerAddress, maxFailuresPerEmail } from './throttle';

const now = new Date('2026-12-02T10:00:00Z');
const none = { email: 0, address: 0, oldestEmailFailure: null, oldestAddressFailure: null };

describe('decide', () => {
	it('lets a first attempt through at once', () => {
		expect(decide(none, now)).toEqual({ allowed: true, delayMs: 0 });
	});

	it('slows answers down after repeated failures, up to 3 s', () => {
		expect(decide({ ...none, email: 1 }, now)).toEqual({ allowed: true, delayMs: 0 });
		expect(decide({ ...none, email: 2 }, now)).toEqual({ allowed: true, delayMs: 1000 });
		expect(decide({ ...none, email: 3 }, now)).toEqual({ allowed: true, delayMs: 2000 });
		expect(decide({ ...none, email: 4 }, now)).toEqual({ allowed: true, delayMs: 3000 });
	});

	it('pauses an e-mail after too many failures until the oldest leaves the window', () => {
		const d = decide(
			{ ...none, email: maxFailuresPerEmail, oldestEmailFailure: new Date('2026-12-02T09:50:00Z') },
			now
		);
		expect(d.allowed).toBe(false);
		if (!d.allowed) {
			expect(d.retryAfterSeconds).toBe(5 * 60);
			expect(d.message).toMatch(/try again in 5 minutes/);
		}
	});

	it('pauses an address that tries many e-mails', () => {
		const d = decide(
			{
				...none,
				address: maxFailuresPerAddress,
				oldestAddressFailure: new Date('2026-12-02T09:59:30Z')
			},
			now
		);
		expect(d.allowed).toBe(false);
		if (!d.allowed) expect(d.message).toMatch(/this device/);
	});
});

describe('the slower global back-off for one e-mail, against distributed guessing', () => {
	const now = new Date('2026-12-04T10:00:00Z');
	it('slows every answer once failures pile up from many addresses', () => {
		expect(decide({ ...none, email: 0, emailAnywhere: 9 }, now)).toEqual({
			allowed: true,
			delayMs: 0
		});
		expect(decide({ ...none, email: 0, emailAnywhere: 10 }, now)).toEqual({
			allowed: true,
			delayMs: 3000
		});
	});
	it('pauses the e-mail everywhere only far above the per-address limit', () => {
		const d = decide(
			{
				...none,
				emailAnywhere: 50,
				oldestEmailAnywhereFailure: new Date('2026-12-04T09:50:00Z')
			},
			now
		);
		expect(d).toMatchObject({ allowed: false, retryAfterSeconds: 300 });
	});
});
