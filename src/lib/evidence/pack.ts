// The evidence pack's shape (zod: the JSON export is checked against it before it leaves), and
// the words that explain how to check the job's hash chain without Benchcall.
import { z } from 'zod';

const spec = z.object({
	unit: z.string().nullable(),
	nominal: z.number().nullable(),
	min: z.number().nullable(),
	max: z.number().nullable()
});

const tool = z.object({
	identifier: z.string(),
	kind: z.string().nullable(),
	calibrationOverdueAtTheTime: z.boolean(),
	calibratedOn: z.string().nullable()
});

export const evidenceEntrySchema = z.object({
	pos: z.number().int().positive(),
	id: z.uuid(),
	kind: z.string(),
	source: z.string(),
	text: z.string(),
	note: z.string().nullable(),
	value: z.number().nullable(),
	unit: z.string().nullable(),
	specValue: z.number().nullable(),
	specUnit: z.string().nullable(),
	verdict: z.string().nullable(),
	/** When the technician's device says it happened (ISO 8601, UTC, microseconds). */
	deviceTime: z.string(),
	/** When the server wrote it. */
	serverTime: z.string(),
	author: z.string(),
	authorRole: z.string(),
	step: z.string().nullable(),
	/** The step's spec as copied onto the job: what the verdict was judged against. */
	spec: spec.nullable(),
	tool: tool.nullable(),
	/** An adapter on the wrench: signed mm along the lever, the tool's length, the setting. */
	adapter: z
		.object({
			mm: z.number(),
			toolLengthMm: z.number().nullable(),
			setting: z.number().nullable(),
			settingUnit: z.string().nullable()
		})
		.nullable(),
	retracts: z.uuid().nullable(),
	respondsTo: z.uuid().nullable(),
	hash: z.string().regex(/^[0-9a-f]{64}$/),
	prevHash: z
		.string()
		.regex(/^[0-9a-f]{64}$/)
		.nullable(),
	/** The exact text whose SHA-256 is `hash`. */
	canonical: z.string()
});
export type EvidenceEntry = z.infer<typeof evidenceEntrySchema>;

const photo = z.object({
	id: z.uuid(),
	entryId: z.uuid().nullable(),
	fileName: z.string(),
	mime: z.string(),
	bytes: z.number().int(),
	storageKey: z.string(),
	/** The recorded downscaled copy (storage key), null while none is made. */
	thumbKey: z.string().nullable(),
	/** SHA-256 of the original file as stored, hex; null until it has been read once. */
	sha256: z
		.string()
		.regex(/^[0-9a-f]{64}$/)
		.nullable(),
	takenAt: z.string()
});

export const evidencePackSchema = z.object({
	format: z.literal('benchcall-evidence-pack/1'),
	generatedAt: z.string(),
	shop: z.string(),
	job: z.object({
		id: z.uuid(),
		number: z.number().int(),
		state: z.string(),
		odometer: z.number().nullable(),
		odometerUnit: z.string(),
		concern: z.string(),
		bay: z.string().nullable(),
		technician: z.string().nullable(),
		openedAt: z.string(),
		signedOffAt: z.string().nullable(),
		signedOffBy: z.string().nullable()
	}),
	vehicle: z
		.object({
			id: z.uuid(),
			registration: z.string(),
			vin: z.string().nullable(),
			make: z.string(),
			model: z.string(),
			year: z.number().nullable(),
			colour: z.string().nullable()
		})
		.nullable(),
	customer: z.object({ id: z.uuid(), name: z.string() }).nullable(),
	chain: z.object({ entries: z.number().int(), headHash: z.string().nullable() }),
	entries: z.array(evidenceEntrySchema),
	stateChanges: z.array(
		z.object({
			from: z.string().nullable(),
			to: z.string(),
			reason: z.string().nullable(),
			at: z.string(),
			by: z.string().nullable()
		})
	),
	photos: z.array(photo)
});
export type EvidencePack = z.infer<typeof evidencePackSchema>;

export const HOW_TO_CHECK = [
	'Every entry of this job log carries a SHA-256 hash of its own content and of the entry before it, written by the database in the same statement as the entry. Changing or removing any entry afterwards breaks the chain from that entry on.',
	'To check without Benchcall: for each entry in order, take its canonical text (the JSON export gives it; its keys are in a fixed order, every value a string or null, and its "prev" is the previous entry\'s hash). Its SHA-256 (for example `printf %s "$canonical" | sha256sum`) must equal the entry\'s hash, and the last entry\'s hash must equal the head hash printed here.',
	"Keep this head hash with the customer's copy: a log that still ends in the same hash has not been changed since this pack was made."
];

/** The JSON export: the pack as checked by its schema, without the shop's storage keys. */
export function toJsonExport(pack: EvidencePack) {
	const checked = evidencePackSchema.parse(pack);
	return {
		...checked,
		howToCheck: HOW_TO_CHECK,
		photos: checked.photos.map((p) => ({
			id: p.id,
			entryId: p.entryId,
			fileName: p.fileName,
			mime: p.mime,
			bytes: p.bytes,
			sha256: p.sha256,
			takenAt: p.takenAt
		}))
	};
}
