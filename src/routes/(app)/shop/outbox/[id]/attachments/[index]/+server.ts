import { error } from '@sveltejs/kit';
import { simpleParser } from 'mailparser';
import { isUuid } from '$lib/ids';
import { requireRole } from '$lib/server/auth';
import { getOutboxMessage } from '$lib/server/mail';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params }) => {
	const user = requireRole('owner', 'service_writer');
	if (!isUuid(params.id) || !/^\d{1,3}$/.test(params.index)) {
		error(404, 'No such attachment.');
	}
	const m = await getOutboxMessage(user.shopId, params.id);
	if (!m) error(404, 'No such message in this shop.');
	const a = (await simpleParser(m.raw)).attachments[Number(params.index)];
	if (!a) error(404, 'No such attachment.');
	const name = (a.filename ?? 'attachment').replace(/[^\w.-]/g, '_');
	return new Response(new Uint8Array(a.content), {
		headers: {
			'content-type': a.contentType || 'application/octet-stream',
			'content-disposition': `attachment; filename="${name}"`,
			'cache-control': 'private, no-store'
		}
	});
};
