// Where a refused Result becomes an HTTP answer: the one mapping of failure kinds to statuses
// ($lib/result.ts). Form actions answer with fail() and the failure's message and field.
import { error, fail } from '@sveltejs/kit';
import { ZodError } from 'zod';
import { isUuid } from '$lib/ids';
import { failure, failureStatus, type Failure, type Result } from '$lib/result';
import { fieldErrors, formError } from '$lib/schemas/form';

export function statusOf(f: Pick<Failure, 'kind'>): number {
	return failureStatus[f.kind];
}

/**
 * A refused form action: `fail()` with the status of the failure's kind (a form that breaks its
 * schema is `invalid`), and its words under `errors` beside what the form sends back (`data`).
 */
export function refuse<D extends object>(why: Failure | ZodError, data: D) {
	if (why instanceof ZodError) {
		return fail(failureStatus.invalid, { ...data, errors: fieldErrors(why) });
	}
	return fail(statusOf(why), { ...data, errors: formError(why.message, why.field) });
}

/** The status of an answer: a failure's by its kind; 201 when it made something new, else 200. */
export function answerStatus(r: Result<{ created?: boolean }>): number {
	return r.ok ? (r.created ? 201 : 200) : statusOf(r);
}

/** The success, or the failure thrown as the HTTP error its kind maps to. */
export function orError<T extends object>(result: Result<T>): { ok: true } & T {
	if (!result.ok) error(statusOf(result), result.message);
	return result;
}

/** The value, or a 404 with `message` when there is none (another shop's id reads the same). */
export function found<T>(value: T | null | undefined, message: string): T {
	if (value === null || value === undefined) orError(failure('not_found', message));
	return value as T;
}

/** An id from the URL, or a 404 (a malformed id names nothing). */
export function requireJobId(id: string): string {
	return found(isUuid(id) ? id : null, 'No such job in this shop.');
}
