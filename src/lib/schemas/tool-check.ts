// The form of a torque tool's check against a tester: the scalars, and the readings at each
// test point (fields set_<i> and r_<i>_<k>, i the point, k the reading).
import { z } from 'zod';
import { inWindow, outOfWindow } from './dates';
import { optionalNumber } from './form';

/** At most this many test points and readings a point (ISO 6789-2 asks for 3 and 5). */
export const MAX_POINTS = 6;
export const MAX_READINGS = 10;

const torque = (what: string) =>
	z
		.number({ error: `${what} must be a number, e.g. 40.6.` })
		.refine(Number.isFinite, `${what} must be a number, e.g. 40.6.`)
		.refine((n) => n >= 0 && n <= 100_000, `${what} must be from 0 to 100000.`);

export const toolCheckSchema = z.object({
	checkedOn: z.iso
		.date('Give the date of the check.')
		.refine((v) => inWindow(new Date(v)), outOfWindow)
		.refine(
			(v) => new Date(v).getTime() <= Date.now() + 86_400_000,
			'A check cannot be dated in the future.'
		),
	checkedBy: z
		.string()
		.trim()
		.min(1, 'Say who checked the tool (a person or a laboratory).')
		.max(120, 'At most 120 characters.'),
	tester: z.string().trim().max(120, 'At most 120 characters.').default(''),
	permissiblePct: optionalNumber((n) => n > 0 && n <= 50, 'A percentage above 0 and at most 50.'),
	note: z
		.string()
		.trim()
		.max(500, 'At most 500 characters.')
		.default('')
		.transform((v) => v || null),
	points: z
		.array(
			z.object({
				set: torque('A test point').refine((n) => n > 0, 'A test point must be above zero.'),
				readings: z
					.array(torque('A reading'))
					.min(1, 'Enter at least one reading at each test point.')
					.max(MAX_READINGS)
			})
		)
		.min(1, 'Enter the readings of at least one test point.')
		.max(MAX_POINTS)
});
export type ToolCheckForm = z.infer<typeof toolCheckSchema>;

const num = (v: string) => Number(v.trim().replace(',', '.'));

/**
 * The form's fields as the schema's input: a point whose readings are all empty is left out;
 * a reading that is not a number stays NaN so the schema names it.
 */
export function checkFormInput(fields: Record<string, string>): Record<string, unknown> {
	const points: { set: number; readings: number[] }[] = [];
	for (let i = 0; i < MAX_POINTS; i++) {
		const set = fields[`set_${i}`];
		if (set === undefined) continue;
		const readings: number[] = [];
		for (let k = 0; k < MAX_READINGS; k++) {
			const r = fields[`r_${i}_${k}`]?.trim();
			if (r) readings.push(num(r));
		}
		if (readings.length) points.push({ set: num(set), readings });
	}
	return { ...fields, points };
}
