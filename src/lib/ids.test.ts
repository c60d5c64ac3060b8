import { describe, expect, it } from 'vitest';
import { isUuid } from './ids';

describe('isUuid', () => {
	it('takes the 8-4-4-4-12 form in either case', () => {
		// RFC 9562 §4: the string form is 8-4-4-4-12 hexadecimal digits, case-insensitive on input.
		expect(isUuid('6f1c2a8e-3b4d-4e5f-8a9b-0c1d2e3f4a5b')).toBe(true);
		expect(isUuid('6F1C2A8E-3B4D-4E5F-8A9B-0C1D2E3F4A5B')).toBe(true);
	});

	it('refuses what only looks like one: 36 hyphens, missing groups, extra text', () => {
		expect(isUuid('-'.repeat(36))).toBe(false);
		expect(isUuid('6f1c2a8e3b4d4e5f8a9b0c1d2e3f4a5b0000')).toBe(false);
		expect(isUuid('6f1c2a8e-3b4d-4e5f-8a9b-0c1d2e3f4a5b\n')).toBe(false);
		expect(isUuid(' 6f1c2a8e-3b4d-4e5f-8a9b-0c1d2e3f4a5b')).toBe(false);
		expect(isUuid('6f1c2a8e-3b4d-4e5f-8a9b-0c1d2e3f4a5g')).toBe(false);
		expect(isUuid('')).toBe(false);
	});
});
