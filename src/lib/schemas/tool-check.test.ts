import { describe, expect, it } from 'vitest';
import { checkFormInput, toolCheckSchema } from './tool-check';

const base = { checkedOn: '2026-12-01', checkedBy: 'Ines (demo)', tester: 'Bench tester (demo)' };

describe('the tool check form', () => {
	it('reads the readings point by point and leaves out empty points', () => {
		const r = toolCheckSchema.safeParse(
			checkFormInput({
				...base,
				set_0: '40',
				r_0_0: '40.6',
				r_0_1: '39,8',
				set_1: '120',
				set_2: '200',
				r_2_0: '203'
			})
		);
		expect(r.success).toBe(true);
		expect(r.data?.points).toEqual([
			{ set: 40, readings: [40.6, 39.8] },
			{ set: 200, readings: [203] }
		]);
		expect(r.data?.permissiblePct).toBeNull();
	});

	it('names bad input instead of failing', () => {
		const bad = toolCheckSchema.safeParse(checkFormInput({ ...base, set_0: '40', r_0_0: 'forty' }));
		expect(bad.success).toBe(false);
		expect(bad.error?.issues[0]?.message).toMatch(/must be a number/);
		const none = toolCheckSchema.safeParse(checkFormInput({ ...base, set_0: '40' }));
		expect(none.error?.issues[0]?.message).toMatch(/at least one test point/);
		const later = toolCheckSchema.safeParse(
			checkFormInput({ ...base, checkedOn: '2099-01-01', set_0: '40', r_0_0: '40' })
		);
		expect(later.success).toBe(false);
		const pct = toolCheckSchema.safeParse(
			checkFormInput({ ...base, permissiblePct: '80', set_0: '40', r_0_0: '40' })
		);
		expect(pct.error?.issues[0]?.message).toMatch(/at most 50/);
	});
});
