import { error } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth';
import { readPhoto } from '$lib/server/photos';
import type { RequestHandler } from './$types';

/** A photo, to signed-in people of the same shop only. */
export const GET: RequestHandler = async ({ params }) => {
	const user = requireUser();
	const photo = await readPhoto(user.shopId, params.photoId);
	if (!photo) error(404, 'No such photo.');
	return new Response(photo.bytes as BodyInit, {
		headers: {
			'content-type': photo.mime,
			'cache-control': 'private, max-age=86400',
			'x-content-type-options': 'nosniff',
			'content-disposition': 'inline'
		}
	});
};
