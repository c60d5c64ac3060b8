import { error } from '@sveltejs/kit';
import { simpleParser } from 'mailparser';
import { isUuid } from '$lib/ids';
import { requireRole } from '$lib/server/auth';
import { getOutboxMessage } from '$lib/server/mail';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const user = requireRole('owner', 'service_writer');
	if (!isUuid(params.id)) error(404, 'No such message.');
	const m = await getOutboxMessage(user.shopId, params.id);
	if (!m) error(404, 'No such message in this shop.');
	const parsed = await simpleParser(m.raw);
	return {
		message: {
			id: m.id,
			to: m.toAddress,
			from: parsed.from?.text ?? '',
			subject: m.subject,
			status: m.status,
			response: m.response,
			createdAt: m.createdAt,
			text: parsed.text ?? '',
			attachments: parsed.attachments.map((a, i) => ({
				index: i,
				filename: a.filename ?? `attachment-${i + 1}`,
				contentType: a.contentType,
				size: a.size
			}))
		}
	};
};
