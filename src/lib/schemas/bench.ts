// Payloads of the Bench API: entries, retractions and the hand-over to final inspection.
import { z } from 'zod';
import { inWindow, outOfWindow } from './dates';
import { MAX_PHRASE_CHARS } from '$lib/phrase';

export const entrySourceValues = ['typed', 'voice'] as const;

export const entryPostSchema = z.object({
	id: z.uuid({ error: 'id must be a UUID made on the device.' }),
	text: z
		.string({ error: 'text is required: what was called out.' })
		.trim()
		.min(1, 'text is empty: call out a step and a value, e.g. "rear axle 80 Nm".')
		.max(MAX_PHRASE_CHARS, `text is at most ${MAX_PHRASE_CHARS} characters.`),
	source: z.enum(entrySourceValues, { error: "source must be 'typed' or 'voice'." }),
	occurredAt: z.iso
		.datetime({ offset: true, error: 'occurredAt must be an ISO 8601 date-time.' })
		.refine((v) => inWindow(new Date(v)), `occurredAt: ${outOfWindow}`)
		.optional(),
	torqueToolId: z.uuid({ error: 'torqueToolId must be a UUID.' }).nullish(),
	/**
	 * An adapter picked on the Bench (not said): signed mm along the lever, negative pointing
	 * back, 0 a crowfoot at 90°. An adapter said in the text wins.
	 */
	adapterMm: z
		.number({ error: 'adapterMm must be a number of millimetres.' })
		.min(-1000, 'adapterMm is at most 1000 mm either way.')
		.max(1000, 'adapterMm is at most 1000 mm either way.')
		.nullish(),
	/** A step picked from the candidates instead of the best match. */
	stepId: z.uuid({ error: 'stepId must be the id of a step of this job.' }).optional(),
	/** A foreman retracting a named entry (an undo without it retracts the author's last one). */
	retracts: z.uuid({ error: 'retracts must be the id of an entry.' }).optional()
});
export type EntryPost = z.infer<typeof entryPostSchema>;

/** The header in which the Bench's outbox names who typed an entry (the account's id). */
export const AUTHOR_HEADER = 'x-benchcall-author';
export const authorHeaderSchema = z
	.uuid({ error: `${AUTHOR_HEADER} must be the id of the account that typed the entry.` })
	.optional();
/** What the server answers (409, code other_account) to an entry sent under another account. */
export const otherAccountMessage =
	'Typed by another account on this device: it is not stored under the one signed in now. It waits on this device until its author signs in again.';

export const entryListQuerySchema = z.object({
	before: z.coerce
		.number({ error: 'before must be a whole number (an entry seq).' })
		.int('before must be a whole number (an entry seq).')
		.positive('before must be above 0.')
		.optional(),
	after: z.coerce
		.number({ error: 'after must be a whole number (an entry seq).' })
		.int('after must be a whole number (an entry seq).')
		.min(0, 'after must be 0 or more.')
		.optional(),
	limit: z.coerce
		.number({ error: 'limit must be a whole number.' })
		.int('limit must be a whole number.')
		.min(1, 'limit must be 1 to 200.')
		.max(200, 'limit must be 1 to 200.')
		.default(50)
});

export const finalInspectionSchema = z.object({
	reason: z
		.string()
		.trim()
		.max(500, 'A reason is at most 500 characters.')
		.optional()
		.transform((v) => (v ? v : undefined))
});
