import { z } from 'zod';

/** Field errors keyed by field, first message each: what a form shows beside its fields. */
export function fieldErrors(error: z.ZodError): Record<string, string> {
	const out: Record<string, string> = {};
	for (const issue of error.issues) {
		const key = String(issue.path[0] ?? 'form');
		out[key] ??= issue.message;
	}
	return out;
}

/**
 * The submitted text fields, to send back with a failed form so nothing typed is lost.
 * Passwords and files are never sent back; over-long values are cut for the echo only.
 */
export function echoValues(form: FormData, omit: string[] = ['password']): Record<string, string> {
	const out: Record<string, string> = {};
	for (const [key, value] of form) {
		if (omit.includes(key) || typeof value !== 'string') continue;
		out[key] = value.slice(0, 2000);
	}
	return out;
}

/** The first message of a zod error, for a 400 that says what to fix. */
export function firstIssue(error: z.ZodError): string {
	return error.issues[0]?.message ?? 'The request is not valid.';
}

/** A message for the whole form, in the same shape as field errors. */
export function formError(message: string, field = 'form'): Record<string, string> {
	return { [field]: message };
}

/**
 * An optional number field: empty is null; otherwise a number (a decimal comma and a trailing
 * "%" accepted) that `ok` accepts, or `message` on the field.
 */
export function optionalNumber(ok: (n: number) => boolean, message: string) {
	return z
		.string()
		.trim()
		.default('')
		.transform((v, ctx) => {
			if (!v) return null;
			const n = Number(v.replace(',', '.').replace(/\s*%$/, ''));
			if (!Number.isFinite(n) || !ok(n)) {
				ctx.addIssue({ code: 'custom', message });
				return z.NEVER;
			}
			return n;
		});
}

/**
 * What a failed action sent back, for the form that sent it: its field errors and the values
 * typed; empty for every other form on the page. `match` singles out one of several forms of
 * the same action (a step's, a setting's); an undefined entry matches any.
 */
export function actionAnswer(
	form: unknown,
	action: string,
	match: Record<string, unknown> = {}
): { errors: Record<string, string>; values: Record<string, string> } {
	const f = (form ?? {}) as Record<string, unknown>;
	const mine =
		f.action === action &&
		Object.entries(match).every(([key, want]) => want === undefined || f[key] === want);
	return {
		errors: (mine ? (f.errors ?? {}) : {}) as Record<string, string>,
		values: (mine ? (f.values ?? {}) : {}) as Record<string, string>
	};
}
