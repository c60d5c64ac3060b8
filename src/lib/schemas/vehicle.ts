import { z } from 'zod';

/** The vehicle search box: anything typed, cut to a sane length; a bad value searches nothing. */
export const vehicleSearchSchema = z.object({
	q: z
		.string()
		.max(100, 'Search with at most 100 characters.')
		.refine((s) => !s.includes('\u0000'), 'That search holds a character that cannot be stored.')
		.catch('')
		.default('')
});

/** The reminder form: where to send it (the customer's address, filled in). */
export const reminderSchema = z.object({
	to: z.email('Give the customer’s e-mail address (name@example.com).').max(200)
});
