import { z } from 'zod';
import { roles } from '$lib/auth/roles';

export const emailField = z
	.string({ error: 'Enter your e-mail address.' })
	.trim()
	.min(1, 'Enter your e-mail address.')
	.max(254, 'An e-mail address is at most 254 characters.')
	.toLowerCase()
	.pipe(z.email('That does not look like an e-mail address.'));

export const signInSchema = z.object({
	email: emailField,
	password: z
		.string({ error: 'Enter your password.' })
		.min(1, 'Enter your password.')
		.max(256, 'A password is at most 256 characters.')
});

const passwordField = z
	.string({ error: 'Choose a password.' })
	.min(10, 'A password needs at least 10 characters.')
	.max(256, 'A password is at most 256 characters.');

export const staffCreateSchema = z.object({
	name: z
		.string({ error: 'Enter a name.' })
		.trim()
		.min(1, 'Enter a name.')
		.max(120, 'At most 120 characters.'),
	email: emailField,
	role: z.enum(roles, { error: 'Pick a role.' }),
	password: passwordField
});

export const staffRoleSchema = z.object({
	userId: z.uuid('Unknown account.'),
	role: z.enum(roles, { error: 'Pick a role.' })
});

export const staffIdSchema = z.object({ userId: z.uuid('Unknown account.') });

export const staffPasswordSchema = z.object({
	userId: z.uuid('Unknown account.'),
	password: passwordField
});
