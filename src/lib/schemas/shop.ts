// Forms of the Shop settings: rates and policies, the price list, torque tools.
import { formatGrade, parseFluidSpec } from '$lib/oil/fluid';
import { z } from 'zod';
import { inWindow, outOfWindow } from './dates';
import { optionalNumber } from './form';
import { canonicalLocale, canonicalTimeZone } from '$lib/format';
import { isKnownCurrency } from '$lib/money';
import { isKnownUnit, dimensionOf } from '$lib/units';

const num = (what: string, min: number, max: number) =>
	z
		.string()
		.trim()
		.min(1, `Give ${what}.`)
		.transform((v, ctx) => {
			const n = Number(v.replace(',', '.'));
			if (!Number.isFinite(n) || n < min || n > max) {
				ctx.addIssue({
					code: 'custom',
					message: `${what[0].toUpperCase()}${what.slice(1)} must be from ${min} to ${max}.`
				});
				return z.NEVER;
			}
			return n;
		});

export const settingsSchema = z.object({
	currency: z
		.string()
		.trim()
		.toUpperCase()
		.refine(
			(c) => /^[A-Z]{3}$/.test(c) && isKnownCurrency(c),
			'Use an ISO 4217 code such as EUR or GBP.'
		),
	/** In the currency's major units as typed ("62.50"); stored in minor units by the server. */
	labourRate: z.string().trim().min(1, 'Give the labour rate per hour.').max(20),
	taxRatePct: num('the tax rate', 0, 100),
	defaultTolerancePct: num('the default tolerance', 0.1, 50),
	idleGapMinutes: num('the idle gap', 1, 480).pipe(z.number().int('Whole minutes.')),
	calibrationMonths: num('the calibration interval', 1, 120).pipe(z.number().int('Whole months.')),
	locale: z
		.string()
		.trim()
		.transform((v, ctx) => {
			const c = canonicalLocale(v);
			if (!c)
				ctx.addIssue({ code: 'custom', message: 'Use a language tag such as en-GB or de-DE.' });
			return c ?? v;
		})
		.optional(),
	timeZone: z
		.string()
		.trim()
		.transform((v, ctx) => {
			const c = canonicalTimeZone(v);
			if (!c) ctx.addIssue({ code: 'custom', message: 'Use a time zone such as Europe/London.' });
			return c ?? v;
		})
		.optional(),
	bays: z
		.string()
		.default('')
		.transform((v) => [
			...new Set(
				v
					.split(/[\n,]/)
					.map((b) => b.trim())
					.filter(Boolean)
			)
		])
		.pipe(
			z
				.array(z.string().max(60, 'A bay name is at most 60 characters.'))
				.max(50, 'At most 50 bays.')
		)
});

export const partSchema = z
	.object({
		partId: z.union([z.uuid(), z.literal('')]).default(''),
		code: z.string().trim().min(1, 'Give a code.').max(60, 'At most 60 characters.'),
		description: z
			.string()
			.trim()
			.min(1, 'Describe the part or fluid.')
			.max(200, 'At most 200 characters.'),
		unit: z.enum(['each', 'L', 'mL'], { error: 'Pick each, L or mL.' }),
		priceMinor: num('the price', 0, 100_000_000).pipe(
			z.number().int('The price is in minor units (whole cents).')
		),
		/** A fluid's grade, stored normalised ("SAE 10W-40 · JASO MA2"); empty: none. */
		fluid: z
			.string()
			.trim()
			.max(120, 'At most 120 characters.')
			.default('')
			.transform((v, ctx) => {
				if (!v) return null;
				const g = parseFluidSpec(v);
				if (!g || g.problems.length) {
					ctx.addIssue({
						code: 'custom',
						message: g?.problems[0] ?? 'Write the grade as the label does.'
					});
					return z.NEVER;
				}
				if (g.sae.length > 1) {
					ctx.addIssue({ code: 'custom', message: 'One fluid has one SAE grade.' });
					return z.NEVER;
				}
				return formatGrade(g);
			})
	})
	.refine((p) => p.fluid === null || p.unit !== 'each', {
		path: ['fluid'],
		message: 'Only fluids sold by the litre or millilitre carry a grade.'
	});

export const toolSchema = z
	.object({
		toolId: z.union([z.uuid(), z.literal('')]).default(''),
		identifier: z
			.string()
			.trim()
			.min(1, 'Give the tool an identifier.')
			.max(60, 'At most 60 characters.'),
		kind: z
			.string()
			.trim()
			.min(1, 'Say what kind of tool it is.')
			.max(120, 'At most 120 characters.'),
		rangeMin: num('the lowest setting', 0, 100_000),
		rangeMax: num('the highest setting', 0, 100_000),
		unit: z
			.string()
			.refine((u) => isKnownUnit(u) && dimensionOf(u) === 'torque', 'Pick a torque unit.'),
		calibratedOn: z
			.union([
				z.iso.date('Give a date.').refine((v) => inWindow(new Date(v)), outOfWindow),
				z.literal('')
			])
			.default(''),
		intervalMonths: optionalNumber(
			(n) => Number.isInteger(n) && n >= 1 && n <= 120,
			'Whole months from 1 to 120.'
		),
		/** Centre of the drive to the handle's load mark, for settings with an adapter. */
		effectiveLengthMm: optionalNumber(
			(n) => n > 0 && n <= 3000,
			'A length in mm, above 0 and at most 3000.'
		)
	})
	.refine((t) => t.rangeMin < t.rangeMax, {
		path: ['rangeMax'],
		message: 'The highest setting must be above the lowest.'
	});

/** One line of the shop's final-inspection checklist: add (no id) or rename. */
export const inspectionItemSchema = z.object({
	itemId: z.union([z.uuid(), z.literal('')]).default(''),
	label: z
		.string()
		.trim()
		.min(1, 'Say what the foreman checks.')
		.max(120, 'At most 120 characters.')
});

/** Move a checklist line up or down, or take it off the list. */
export const inspectionItemChangeSchema = z.object({
	itemId: z.uuid('No such checklist item.'),
	change: z.enum(['up', 'down', 'remove'], { error: 'Move up, move down or remove.' })
});
