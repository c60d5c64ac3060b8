// Reading request bodies in actions and endpoints. A body that cannot be read, or that holds
// text PostgreSQL cannot store, is the sender's fault: a 400 with words (413 when it is over
// the server's size limit), never a 500.
import { error } from '@sveltejs/kit';
import { failureStatus } from '$lib/result';
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
