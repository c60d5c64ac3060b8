// Procedures: the editor's forms and Benchcall's procedure file (JSON, versioned).
// The JSON Schema served at /api/procedures/schema is generated from `procedureFileSchema`.
import { z } from 'zod';
import { toStoredSpec } from '$lib/procedures/spec';
import { isKnownUnit } from '$lib/units';
import { parseFluidSpec } from '$lib/oil/fluid';
import { ADAPTER_DIRECTIONS, MAX_ADAPTER_MM } from '$lib/torque/adapter';

export const PROCEDURE_FILE_FORMAT = 'benchcall.procedures';
export const PROCEDURE_FILE_VERSION = 1;

const text = (max: number, what: string) =>
	z
		.string({ error: `${what} must be text.` })
		.trim()
		.max(max, `${what} is at most ${max} characters.`);

const num = (what: string) =>
	z
		.number({ error: `${what} must be a number.` })
		.refine(Number.isFinite, `${what} must be a number.`);

const unitCode = z
	.string({ error: 'The unit must be a UCUM code such as N.m, L or mm.' })
	.refine(isKnownUnit, {
		error: (issue) =>
			`Benchcall does not know the unit '${String(issue.input)}': use a UCUM code such as N.m, L or mm.`
	});

/** A fluid spec as the manual writes it: "SAE 10W-30, API SJ or higher, JASO MA", "DOT 4". */
const fluidSpec = text(300, 'The fluid spec').superRefine((v, ctx) => {
	const problem = parseFluidSpec(v)?.problems[0];
	if (problem) ctx.addIssue({ code: 'custom', message: problem });
});

const ADAPTER_HELP =
	"An adapter the step is done with (a crowfoot on a flare nut, an extension): its length in mm from the wrench's drive to the fastener's centre, and how it sits on the wrench: out (along it, away from the hand), back (towards the hand) or square (at 90°, no correction). The Bench shows the wrench setting from it; an adapter said or picked at the bench overrides it.";
const adapterLength = num('The adapter length')
	.min(0, 'The adapter length cannot be negative.')
	.max(MAX_ADAPTER_MM, `The adapter length is at most ${MAX_ADAPTER_MM} mm.`);
const adapterDirection = z.enum(ADAPTER_DIRECTIONS, {
	error: 'The adapter direction is out, back or square.'
});

/** One step of a procedure in the file. Values are in `unit`. */
export const procedureFileStep = z
	.object({
		label: text(200, 'A step label').min(1, 'A step needs a label.'),
		aliases: z.array(text(100, 'An alias').min(1, 'An alias cannot be empty.')).max(20).default([]),
		unit: unitCode.nullable().default(null),
		nominal: num('The nominal value').nullable().default(null),
		min: num('Min').nullable().default(null),
		max: num('Max').nullable().default(null),
		caution: text(2000, 'The caution').nullable().default(null),
		fluid: fluidSpec
			.nullable()
			.default(null)
			.transform((v) => v || null)
			.meta({
				description:
					'The fluid spec as the manual writes it (SAE J300 grade, API category, JASO class; or the DOT class of brake fluid).'
			}),
		adapter: z
			.object({ lengthMm: adapterLength, direction: adapterDirection })
			.nullable()
			.default(null)
			.meta({ description: ADAPTER_HELP }),
		part: z
			.object({
				code: text(60, 'The part code').min(1, 'A part needs its price-list code.'),
				quantity: num('The quantity').positive('The quantity must be more than 0.')
			})
			.nullable()
			.default(null)
	})
	.superRefine((step, ctx) => {
		const spec = toStoredSpec(step);
		if (!spec.ok) ctx.addIssue({ code: 'custom', path: [spec.field], message: spec.message });
		if (step.unit === null && (step.nominal !== null || step.min !== null || step.max !== null)) {
			ctx.addIssue({ code: 'custom', path: ['unit'], message: 'A value needs a unit.' });
		}
	});

export const procedureFileEntry = z.object({
	name: text(200, 'A procedure name').min(1, 'A procedure needs a name.'),
	appliesTo: text(500, 'Applies to').default(''),
	flatRateHours: num('Flat-rate hours')
		.min(0, 'Flat-rate hours cannot be negative.')
		.max(200, 'Flat-rate hours are at most 200.')
		.default(0),
	steps: z.array(procedureFileStep).max(300, 'A procedure has at most 300 steps.')
});
export type ProcedureFileEntry = z.output<typeof procedureFileEntry>;

/** Benchcall's procedure file, version 1. */
export const procedureFileSchema = z
	.object({
		format: z.literal(PROCEDURE_FILE_FORMAT, {
			error: `This is not a Benchcall procedure file: "format" must be "${PROCEDURE_FILE_FORMAT}".`
		}),
		version: z.literal(PROCEDURE_FILE_VERSION, {
			error: `Benchcall reads version ${PROCEDURE_FILE_VERSION} of the procedure file.`
		}),
		exportedAt: z.string().optional(),
		procedures: z
			.array(procedureFileEntry)
			.min(1, 'The file holds no procedures.')
			.max(500, 'At most 500 procedures at once.')
	})
	.meta({
		title: 'Benchcall procedure file',
		description:
			'Procedures with their steps and specs. Units are UCUM codes; min/max are stored limits; a part is named by its price-list code.'
	});
export type ProcedureFile = z.output<typeof procedureFileSchema>;

/** The JSON Schema of the procedure file, generated from the zod schema. */
export function procedureFileJsonSchema() {
	return z.toJSONSchema(procedureFileSchema, { io: 'input', unrepresentable: 'any' });
}

export interface Problem {
	/** Where: "procedures[0].steps[2].unit", or "row 4, column unit" for CSV. */
	where: string;
	message: string;
}

/** Zod issues as problems with a readable path. */
export function issuesToProblems(error: z.ZodError): Problem[] {
	return error.issues.map((issue) => ({
		where:
			issue.path
				.map((p, i) => (typeof p === 'number' ? `[${p}]` : `${i === 0 ? '' : '.'}${String(p)}`))
				.join('') || 'file',
		message: issue.message
	}));
}

/** Reads a procedure file's text: JSON syntax errors and schema problems, never a throw. */
export function readProcedureFile(
	text: string
): { ok: true; file: ProcedureFile } | { ok: false; problems: Problem[] } {
	let json: unknown;
	try {
		json = JSON.parse(text);
	} catch (e) {
		return {
			ok: false,
			problems: [{ where: 'file', message: `Not valid JSON: ${(e as Error).message}` }]
		};
	}
	const parsed = procedureFileSchema.safeParse(json);
	if (!parsed.success) return { ok: false, problems: issuesToProblems(parsed.error) };
	return { ok: true, file: parsed.data };
}

// ——— Editor forms ———

const optionalNumber = (what: string) =>
	z
		.string()
		.trim()
		.optional()
		.transform((v, ctx) => {
			if (v === undefined || v === '') return null;
			const n = Number(v.replace(',', '.'));
			if (!Number.isFinite(n)) {
				ctx.addIssue({ code: 'custom', message: `${what} must be a number.` });
				return z.NEVER;
			}
			return n;
		});

export const procedureFormSchema = z.object({
	name: text(200, 'The name').min(1, 'Give the procedure a name.'),
	appliesTo: text(500, 'Applies to').default(''),
	flatRateHours: optionalNumber('Flat-rate hours').pipe(
		z
			.number()
			.min(0, 'Flat-rate hours cannot be negative.')
			.max(200, 'At most 200 hours.')
			.nullable()
	),
	/** Service interval; a form without these fields (the short create form) sets none. */
	intervalKm: optionalNumber('The distance interval').pipe(
		z
			.number()
			.int('Give the distance interval in whole units.')
			.min(1, 'The distance interval must be more than 0.')
			.max(1_000_000, 'At most 1,000,000.')
			.nullable()
	),
	intervalMonths: optionalNumber('The months interval').pipe(
		z
			.number()
			.int('Give the interval in whole months.')
			.min(1, 'The months interval must be at least 1.')
			.max(240, 'At most 240 months.')
			.nullable()
	)
});

export const stepFormSchema = z
	.object({
		stepId: z.union([z.uuid(), z.literal('')]).optional(),
		label: text(200, 'The label').min(1, 'Give the step a label.'),
		aliases: text(1000, 'Aliases')
			.default('')
			.transform((v) =>
				v
					.split(/[,;\n]/)
					.map((a) => a.trim())
					.filter(Boolean)
			),
		unit: z
			.string()
			.trim()
			.default('')
			.refine((u) => u === '' || isKnownUnit(u), 'Pick a unit from the list.'),
		nominal: optionalNumber('The nominal value'),
		min: optionalNumber('Min'),
		max: optionalNumber('Max'),
		plusMinus: optionalNumber('The ± tolerance'),
		caution: text(2000, 'The caution').default(''),
		fluid: fluidSpec.default(''),
		adapterLengthMm: optionalNumber('The adapter length').pipe(adapterLength.nullable()),
		adapterDirection: z.union([adapterDirection, z.literal('')]).default(''),
		partId: z.union([z.uuid('Pick a part from the price list.'), z.literal('')]).default(''),
		partQuantity: optionalNumber('The quantity')
	})
	.superRefine((v, ctx) => {
		const spec = toStoredSpec(v);
		if (!spec.ok) ctx.addIssue({ code: 'custom', path: [spec.field], message: spec.message });
		if (v.unit === '' && (v.nominal !== null || v.min !== null || v.max !== null)) {
			ctx.addIssue({ code: 'custom', path: ['unit'], message: 'A value needs a unit.' });
		}
		if (v.adapterLengthMm !== null && v.adapterDirection === '') {
			ctx.addIssue({
				code: 'custom',
				path: ['adapterDirection'],
				message: 'Say how the adapter sits on the wrench.'
			});
		}
		if (v.adapterLengthMm === null && v.adapterDirection !== '') {
			ctx.addIssue({
				code: 'custom',
				path: ['adapterLengthMm'],
				message: 'Give the adapter’s length in mm (any length for one at 90°).'
			});
		}
		if (v.partId && (v.partQuantity === null || v.partQuantity <= 0)) {
			ctx.addIssue({
				code: 'custom',
				path: ['partQuantity'],
				message: 'Give the quantity billed for the part.'
			});
		}
	});
export type StepForm = z.output<typeof stepFormSchema>;

export const stepIdSchema = z.object({ stepId: z.uuid('Unknown step.') });
export const stepMoveSchema = z.object({
	stepId: z.uuid('Unknown step.'),
	direction: z.enum(['up', 'down'])
});

/** The import form: a file, or the text of one sent back from the preview. */
export const importFormSchema = z.object({
	kind: z.enum(['json', 'csv']),
	content: z
		.string()
		.max(2_000_000, 'The file is over 2 MB.')
		.refine((v) => v.trim().length > 0, 'Choose a file to import.')
});
