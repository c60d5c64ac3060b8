import { error, json } from '@sveltejs/kit';
import { requireRole, requireUser } from '$lib/server/auth';
import { getJob } from '$lib/server/bench/job';
import { appendEntry } from '$lib/server/log/append';
import { listEntries } from '$lib/server/log/read';
import { answerStatus, orError } from '$lib/server/http';
import { readBody, valid } from '$lib/server/request';
import {
	AUTHOR_HEADER,
	authorHeaderSchema,
	entryListQuerySchema,
	entryPostSchema,
	otherAccountMessage
} from '$lib/schemas/bench';
import type { RequestHandler } from './$types';

/** The job log, newest first: `before` pages back, `after` catches up (keyset on seq). */
export const GET: RequestHandler = async ({ params, url }) => {
	const user = requireUser();
	const query = valid(entryListQuerySchema, Object.fromEntries(url.searchParams));
	const job = await getJob(user.shopId, params.jobId);
	if (!job) error(404, 'No such job.');
	return json(await listEntries(user.shopId, job.id, query));
};

/** Appends one entry; the same id again answers 200 with the stored entry. */
export const POST: RequestHandler = async ({ params, request }) => {
	// An outbox on a shared tablet names who typed the entry: it is never stored under another
	// account. Checked before the role, so the entry waits for its author instead of being
	// refused for good because someone else is signed in now.
	const author = valid(authorHeaderSchema, request.headers.get(AUTHOR_HEADER) ?? undefined);
	if (author && author !== requireUser().id) {
		return json({ message: otherAccountMessage, code: 'other_account' }, { status: 409 });
	}
	const user = requireRole('technician', 'foreman', 'owner');
	const body = await readBody(
		request,
		entryPostSchema,
		'The body must be JSON: { id, text, source, occurredAt? }.'
	);
	const result = await appendEntry(user, params.jobId, body);
	const ok = orError(result);
	if ('answer' in ok) return json({ answer: ok.answer }, { status: 200 });
	return json({ entry: ok.entry }, { status: answerStatus(ok) });
};
