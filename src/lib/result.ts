// One shape for an outcome that can be refused: success with its values, or a failure with a
// kind and words for the person. Domain code returns it and never throws HTTP errors; routes
// turn a failure into a response in one place ($lib/server/http.ts) with `failureStatus`.

/** Each kind of refusal and the HTTP status it answers with. */
export const failureStatus = {
	/** The input cannot be used as sent (a form or body that breaks a rule). */
	invalid: 400,
	/** The person may not do this (role, or a job not assigned to them). */
	forbidden: 403,
	/** No such thing in this shop (another shop's id reads the same). */
	not_found: 404,
	/** The thing's state does not allow it now (closed, changed meanwhile, already done). */
	conflict: 409,
	/** Larger than the server takes in one request (an upload over its size limit). */
	too_large: 413,
	/** Well-formed, but the rules refuse it (a reason missing, a step not on the job). */
	unprocessable: 422,
	/** Too many tries in a short time (sign-in throttling). */
	too_many: 429,
	/** A service the shop relies on (the mail server) did not take it: the sender can retry. */
	upstream: 502
} as const;

export type FailureKind = keyof typeof failureStatus;

export interface Failure {
	ok: false;
	kind: FailureKind;
	message: string;
	/** The form field the refusal is about, when there is one. */
	field?: string;
}

/** `F` is what a failure carries besides its words (the problems of an import, a wait). */
export type Result<T extends object = object, F extends object = object> =
	({ ok: true } & T) | (Failure & F);

export function failure(kind: FailureKind, message: string, field?: string): Failure {
	return field === undefined ? { ok: false, kind, message } : { ok: false, kind, message, field };
}
