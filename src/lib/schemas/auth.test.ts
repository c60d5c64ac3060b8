import { describe, expect, it } from 'vitest';
import { signInSchema, staffCreateSchema } from './auth';
import { fieldErrors } from './form';

describe('signInSchema', () => {
	it('normalises the e-mail', () => {
		const r = signInSchema.safeParse({ email: '  Tomasz@KettleStreet.TEST ', password: 'x' });
		expect(r.success && r.data.email).toBe('tomasz@kettlestreet.test');
	});
	it('refuses a 10 kB e-mail with a message, not a crash', () => {
		const r = signInSchema.safeParse({ email: 'a'.repeat(10_000) + '@x.test', password: 'x' });
		expect(r.success).toBe(false);
		if (!r.success) expect(fieldErrors(r.error).email).toMatch(/at most 254/);
	});
	it('asks for both fields when the form is empty', () => {
		const r = signInSchema.safeParse({});
		expect(r.success).toBe(false);
		if (!r.success) {
			const errors = fieldErrors(r.error);
			expect(errors.email).toBe('Enter your e-mail address.');
			expect(errors.password).toBe('Enter your password.');
		}
	});
});

describe('staffCreateSchema', () => {
	it('needs a role Benchcall knows and a long enough password', () => {
		const r = staffCreateSchema.safeParse({
			name: 'A',
			email: 'a@b.test',
			role: 'boss',
			password: 'short'
		});
		expect(r.success).toBe(false);
		if (!r.success) {
			const errors = fieldErrors(r.error);
			expect(errors.role).toBe('Pick a role.');
			expect(errors.password).toMatch(/at least 10/);
		}
	});
});
