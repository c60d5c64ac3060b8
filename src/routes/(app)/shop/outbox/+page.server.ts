import { requireRole } from '$lib/server/auth';
import { listOutbox } from '$lib/server/mail';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const user = requireRole('owner', 'service_writer');
	return { messages: await listOutbox(user.shopId) };
};
