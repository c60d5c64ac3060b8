import { error, json } from '@sveltejs/kit';
import { requireRole, requireUser } from '$lib/server/auth';
import { getJob } from '$lib/server/bench/job';
import { appendEntry } from '$lib/server/log/append';
import { listEntries } from '$lib/server/log/read';
import { orError } from '$lib/server/http';
import { readJson } from '$lib/server/request';
import {
	AUTHOR_HEADER,
	authorHeaderSchema,
	entryListQuerySchema,
	entryPostSchema,
	firstIssue,
	otherAccountMessage
} from '$lib/schemas/bench';
import type { RequestHandler } from './$types';

/** The job log, newest first: `before` pages back, `after` catches up (keyset on seq). */
export const GET: RequestHandler = async ({ params, url }) => {
	const user = requireUser();
	const query = entryListQuerySchema.safeParse(Object.fromEntries(url.searchParams));
	if (!query.success) error(400, firstIssue(query.error));
	const job = await getJob(user.shopId, params.jobId);
	if (!job) error(404, 'No such job.');
	return json(await listEntries(user.shopId, job.id, query.data));
};

/** Appends one entry; the same id again answers 200 with the stored entry. */
export const POST: RequestHandler = async ({ params, request }) => {
	// An outbox on a shared tablet names who typed the entry: it is never stored under another
	// account. Checked before the role, so the entry waits for its author instead of being
	// refused for good because someone else is signed in now.
	const author = authorHeaderSchema.safeParse(request.headers.get(AUTHOR_HEADER) ?? undefined);
	if (!author.success) error(400, firstIssue(author.error));
	if (author.data && author.data !== requireUser().id) {
		return json({ message: otherAccountMessage, code: 'other_account' }, { status: 409 });
	}
	const user = requireRole('technician', 'foreman', 'owner');
	const body = await readJson(request, 'The body must be JSON: { id, text, source, occurredAt? }.');
	const parsed = entryPostSchema.safeParse(body);
	if (!parsed.success) error(400, firstIssue(parsed.error));
	const result = await appendEntry(user, params.jobId, parsed.data);
	const ok = orError(result);
	if ('answer' in ok) return json({ answer: ok.answer }, { status: 200 });
	return json({ entry: ok.entry }, { status: ok.created ? 201 : 200 });
};
