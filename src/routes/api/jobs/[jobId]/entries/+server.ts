import { error, json } from '@sveltejs/kit';
import { requireRole, requireUser } from '$lib/server/auth';
import { appendEntry, getJob, listEntries } from '$lib/server/entries';
import { readJson } from '$lib/server/request';
import { entryListQuerySchema, entryPostSchema, firstIssue } from '$lib/schemas/bench';
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
	const user = requireRole('technician', 'foreman', 'owner');
	const body = await readJson(request, 'The body must be JSON: { id, text, source, occurredAt? }.');
	const parsed = entryPostSchema.safeParse(body);
	if (!parsed.success) error(400, firstIssue(parsed.error));
	const result = await appendEntry(user, params.jobId, parsed.data);
	if ('message' in result) error(result.status, result.message);
	if ('answer' in result) return json({ answer: result.answer }, { status: 200 });
	return json({ entry: result.entry }, { status: result.status });
};
