// Payloads and query strings of the Floor (the foreman's live view of the shop).
import { z } from 'zod';
import { decodeResume } from '$lib/floor/resume';

const uuid = z.uuid({ message: 'That is not a valid id.' });

/** Filters of the running log, from the query string. Empty strings mean "any". */
export const logFilterSchema = z.object({
	bay: z.string().trim().max(60).optional(),
	technician: z.union([uuid, z.literal('')]).optional(),
	job: z
		.string()
		.trim()
		.regex(/^\d{0,9}$/, 'A job number is digits only.')
		.optional(),
	verdict: z.enum(['', 'in', 'low', 'high', 'no_spec', 'out']).optional(),
	q: z.string().trim().max(120).optional()
});
export type LogFilterInput = z.infer<typeof logFilterSchema>;

/** A page of the running log: entries older than `before` (a seq). */
export const logPageSchema = logFilterSchema.extend({
	before: z.coerce.number().int().positive().optional()
});

/** The out-of-spec queue's next page: items after this seq. */
export const queueAfterSchema = z.coerce.number().int().nonnegative().optional();

/** Where a live stream resumes: the last event id the browser saw (a seq, or `seq.mark`). */
export const streamAfterSchema = z.string().transform((raw, ctx) => {
	const point = decodeResume(raw);
	if (!point) {
		ctx.addIssue({ code: 'custom', message: 'after must be the last event id seen (a seq).' });
		return z.NEVER;
	}
	return point;
});

export const acceptSchema = z.object({
	reason: z
		.string({ message: 'Give a reason for accepting this value.' })
		.trim()
		.min(3, 'Give a reason for accepting this value (a few words at least).')
		.max(500, 'Keep the reason under 500 characters.')
});

export const redoSchema = z.object({
	note: z
		.string({ message: 'Tell the technician what to redo.' })
		.trim()
		.min(3, 'Tell the technician what to redo (a few words at least).')
		.max(500, 'Keep the note under 500 characters.')
});

export const inspectionTickSchema = z.object({
	itemId: uuid,
	ticked: z.boolean()
});

export const driftQuerySchema = z.object({
	step: z.union([uuid, z.literal('')]).optional(),
	tool: z.union([uuid, z.literal('')]).optional(),
	/** The window's first and last day (YYYY-MM-DD); checked by driftWindow() for its message. */
	from: z.string().max(40).optional(),
	to: z.string().max(40).optional()
});
