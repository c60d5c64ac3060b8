// Where a refused Result becomes an HTTP answer: the one mapping of failure kinds to statuses
// ($lib/result.ts). Form actions answer with fail() and the failure's message and field.
import { error } from '@sveltejs/kit';
import { isUuid } from '$lib/ids';
import { failure, failureStatus, type Failure, type Result } from '$lib/result';

export function statusOf(f: Pick<Failure, 'kind'>): number {
	return failureStatus[f.kind];
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
