// Forms of the Jobs area: intake, assignment, state changes, extra-work approval, the table's
// query string.
import { z } from 'zod';
import { inWindow, outOfWindow, readDate } from './dates';
import { jobStates } from '$lib/jobs/states';
import { emailField } from './auth';

const text = (max: number, what: string) =>
	z
		.string({ error: `${what} must be text.` })
		.trim()
		.max(max, `${what} is at most ${max} characters.`);
const optText = (max: number, what: string) =>
	text(max, what)
		.optional()
		.transform((v) => (v ? v : null));
const optInt = (what: string, min: number, maxValue: number) =>
	z
		.string()
		.trim()
		.optional()
		.transform((v, ctx) => {
			if (!v) return null;
			const n = Number(v.replace(/[\s_]/g, ''));
			if (!Number.isInteger(n) || n < min || n > maxValue) {
				ctx.addIssue({
					code: 'custom',
					message: `${what} must be a whole number from ${min} to ${maxValue}.`
				});
				return z.NEVER;
			}
			return n;
		});

export const fuelLevels = ['empty', 'quarter', 'half', 'three_quarters', 'full'] as const;
export const fuelLabels: Record<(typeof fuelLevels)[number], string> = {
	empty: 'Reserve / empty',
	quarter: '¼',
	half: '½',
	three_quarters: '¾',
	full: 'Full'
};

/**
 * Intake. `pick` says who and what the job is for: `v:<vehicle id>` (a known vehicle and its
 * customer), `c:<customer id>` (a known customer, a new vehicle) or `new` (both new).
 */
export const intakeSchema = z
	.object({
		pick: z
			.string()
			.trim()
			.default('new')
			.refine(
				(v) => v === 'new' || /^[vc]:[0-9a-f-]{36}$/i.test(v),
				'Pick a customer and vehicle.'
			),
		customerName: text(120, 'The name').default(''),
		customerPhone: optText(40, 'The phone number'),
		customerEmail: z
			.string()
			.trim()
			.optional()
			.transform((v) => v || null)
			.pipe(z.union([z.null(), emailField])),
		registration: text(20, 'The registration')
			.default('')
			.transform((v) => v.toUpperCase()),
		frameNumber: optText(40, 'The frame number').transform((v) => v?.toUpperCase() ?? null),
		make: text(60, 'The make').default(''),
		model: text(60, 'The model').default(''),
		year: optInt('The year', 1900, 2100),
		colour: optText(40, 'The colour'),
		odometer: optInt('The odometer reading', 0, 9_999_999),
		odometerUnit: z.enum(['km', 'mi']).default('km'),
		fuelLevel: z
			.union([z.enum(fuelLevels), z.literal('')])
			.default('')
			.transform((v) => v || null),
		damageNotes: optText(2000, 'Damage notes'),
		concern: text(2000, 'The concern').min(1, "Write down the customer's concern."),
		requestedWork: optText(2000, 'Requested work'),
		promisedAt: z
			.string()
			.trim()
			.optional()
			.transform((v, ctx) => {
				if (!v) return null;
				const d = readDate(v);
				if (!d) {
					ctx.addIssue({ code: 'custom', message: 'Give a date and time.' });
					return z.NEVER;
				}
				if (!inWindow(d)) {
					ctx.addIssue({ code: 'custom', message: outOfWindow });
					return z.NEVER;
				}
				return d;
			}),
		procedureIds: z.array(z.uuid('Unknown procedure.')).max(20).default([]),
		technicianId: z.union([z.uuid('Unknown technician.'), z.literal('')]).default(''),
		bay: text(60, 'The bay').default('')
	})
	.superRefine((v, ctx) => {
		if (v.pick === 'new' && !v.customerName) {
			ctx.addIssue({
				code: 'custom',
				path: ['customerName'],
				message: "Give the customer's name."
			});
		}
		if (!v.pick.startsWith('v:')) {
			if (!v.registration) {
				ctx.addIssue({ code: 'custom', path: ['registration'], message: 'Give the registration.' });
			}
			if (!v.make) ctx.addIssue({ code: 'custom', path: ['make'], message: 'Give the make.' });
			if (!v.model) ctx.addIssue({ code: 'custom', path: ['model'], message: 'Give the model.' });
		}
	});
export type IntakeInput = z.output<typeof intakeSchema>;

/** FormData → the object the intake schema reads (procedureIds is a repeated field). */
export function intakeFromForm(form: FormData) {
	return {
		...Object.fromEntries(form),
		procedureIds: form.getAll('procedureIds').filter((v) => typeof v === 'string' && v)
	};
}

export const assignSchema = z.object({
	technicianId: z.union([z.uuid('Unknown technician.'), z.literal('')]).default(''),
	bay: text(60, 'The bay').default('')
});

export const transitionSchema = z.object({
	to: z.enum(jobStates, { error: 'Pick a state.' }),
	reason: text(500, 'The reason').default(''),
	expectedFrom: z.enum(jobStates).optional()
});

export const approvalChannels = ['in_person', 'phone', 'email', 'text_message'] as const;
export const approvalChannelLabels: Record<(typeof approvalChannels)[number], string> = {
	in_person: 'In person',
	phone: 'Phone',
	email: 'E-mail',
	text_message: 'Text message'
};

/** Extra work: the customer's approval is recorded before the procedure's steps are copied. */
export const extraWorkSchema = z.object({
	procedureId: z.uuid('Pick a procedure.'),
	description: text(500, 'The description').min(1, 'Describe the extra work.'),
	approvedBy: text(120, 'Who approved').min(1, 'Say who approved it.'),
	channel: z.enum(approvalChannels, { error: 'Say how it was approved.' }),
	approvedAt: z
		.string()
		.trim()
		.min(1, 'Say when it was approved.')
		.transform((v, ctx) => {
			const d = readDate(v);
			if (!d) {
				ctx.addIssue({ code: 'custom', message: 'Give a date and time.' });
				return z.NEVER;
			}
			if (!inWindow(d)) {
				ctx.addIssue({ code: 'custom', message: outOfWindow });
				return z.NEVER;
			}
			if (d.getTime() > Date.now() + 5 * 60_000) {
				ctx.addIssue({ code: 'custom', message: 'An approval cannot be in the future.' });
				return z.NEVER;
			}
			return d;
		})
});

export const jobSortColumns = [
	'number',
	'customer',
	'registration',
	'state',
	'technician',
	'bay',
	'created'
] as const;

/** The jobs table's query string. Bad values fall back to defaults rather than failing. */
export const jobTableQuerySchema = z.object({
	q: z.string().trim().max(120).catch(''),
	state: z.union([z.enum(jobStates), z.literal('active'), z.literal('')]).catch(''),
	technician: z.union([z.uuid(), z.literal('none'), z.literal('')]).catch(''),
	bay: z.string().trim().max(60).catch(''),
	from: z.union([z.iso.date(), z.literal('')]).catch(''),
	to: z.union([z.iso.date(), z.literal('')]).catch(''),
	sort: z.enum(jobSortColumns).catch('number'),
	dir: z.enum(['asc', 'desc']).catch('desc'),
	page: z.coerce.number().int().min(1).max(100_000).catch(1),
	size: z.coerce
		.number()
		.int()
		.refine((n) => [10, 25, 50, 100].includes(n))
		.catch(25)
});
export type JobTableQuery = z.output<typeof jobTableQuerySchema>;
