import { describe, expect, it } from 'vitest';
import { makeShop } from './db/fixtures';
import { createStaff } from './staff';

const input = (email: string) =>
	({ name: 'New Hand', email, role: 'technician', password: 'a-long-password-1' }) as const;

describe('createStaff', () => {
	it("refuses another shop's e-mail without saying that an account exists there", async () => {
		const a = await makeShop('Staff A');
		const b = await makeShop('Staff B');
		const r = await createStaff(a.shop.id, input(b.tech.email));
		expect(r.ok).toBe(false);
		const message = r.ok ? '' : r.message;
		expect(message).not.toMatch(/exist|another shop|already/i);
		expect(message).not.toContain(b.tech.name);
		expect(message).toMatch(/another address/);
	});

	it('names the colleague when the e-mail is already used in this shop', async () => {
		const a = await makeShop('Staff A');
		const r = await createStaff(a.shop.id, input(a.tech.email));
		expect(r).toMatchObject({ ok: false, field: 'email' });
		expect(r.ok ? '' : r.message).toContain('Tech already signs in');
	});
});
