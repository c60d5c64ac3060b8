// Reading request bodies in actions and endpoints. A body that cannot be read, that holds
// text PostgreSQL cannot store, or that breaks its schema is the sender's fault: a 400 with
// words (413 when it is over the server's size limit), never a 500. Every endpoint answers
// these through error(), so a 400 has one shape: `{ message }`, or the error page for HTML.
import { error } from '@sveltejs/kit';
import type { z } from 'zod';
import { failureStatus } from '$lib/result';
import { firstIssue } from '$lib/schemas/form';
import { hasNul, nulMessage } from '$lib/nul';
import { isTooLarge } from '$lib/uploads/check';

export const tooLargeMessage =
	'That upload is more than the server takes in one go. Photos go one or two at a time, each at most 10 MB.';

/** The form of an action's request, or an error the sender can act on. */
export async function readForm(request: Request): Promise<FormData> {
	let form: FormData;
	try {
		form = await request.formData();
	} catch (e) {
		if (isTooLarge(e)) error(failureStatus.too_large, tooLargeMessage);
		error(failureStatus.invalid, 'The form could not be read. Reload the page and send it again.');
	}
	for (const [key, value] of form) {
		if (hasNul(key) || (typeof value === 'string' && hasNul(value)))
			error(failureStatus.invalid, nulMessage);
	}
	return form;
}

/** The parsed JSON body; `unreadable` says what to send when it is not JSON. */
export async function readJson(request: Request, unreadable: string): Promise<unknown> {
	let body: unknown;
	try {
		body = await request.json();
	} catch (e) {
		// Over the server's body limit (adapter-node's BODY_SIZE_LIMIT): the size is the fault.
		if (isTooLarge(e))
			error(failureStatus.too_large, 'The body is larger than the server takes in one request.');
		error(failureStatus.invalid, unreadable);
	}
	if (hasNul(body)) error(failureStatus.invalid, nulMessage);
	return body;
}

/** `input` (a body, a query value) checked with `schema`, or a 400 naming the first problem. */
export function valid<S extends z.ZodType>(schema: S, input: unknown): z.output<S> {
	const checked = schema.safeParse(input);
	if (!checked.success) error(failureStatus.invalid, firstIssue(checked.error));
	return checked.data;
}

/** The JSON body checked with `schema`; `unreadable` says what to send when it is not JSON. */
export async function readBody<S extends z.ZodType>(
	request: Request,
	schema: S,
	unreadable: string
): Promise<z.output<S>> {
	return valid(schema, await readJson(request, unreadable));
}
