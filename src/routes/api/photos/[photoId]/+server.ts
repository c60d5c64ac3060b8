import { error } from '@sveltejs/kit';
import { z } from 'zod';
import { requireUser } from '$lib/server/auth';
import { readPhoto } from '$lib/server/photos';
import { valid } from '$lib/server/request';
import type { RequestHandler } from './$types';

const query = z.object({
	size: z
		.enum(['copy', 'original'], { error: 'size must be "copy" or "original".' })
		.default('original')
});

/**
 * A photo, to signed-in people of the same shop only. `?size=copy` answers its downscaled copy
 * (lists and thumbnails on a tablet's Wi-Fi), or the original while no copy is made yet.
 */
export const GET: RequestHandler = async ({ params, url }) => {
	const user = requireUser();
	const { size } = valid(query, Object.fromEntries(url.searchParams));
	const photo = await readPhoto(user.shopId, params.photoId, undefined, { copy: size === 'copy' });
	if (!photo) error(404, 'No such photo.');
	return new Response(photo.bytes as BodyInit, {
		headers: {
			'content-type': photo.mime,
			// a copy asked for and not made yet is not kept: the next look gets the copy
			'cache-control':
				size === 'copy' && !photo.copy ? 'private, no-store' : 'private, max-age=86400',
			'x-content-type-options': 'nosniff',
			'content-disposition': 'inline'
		}
	});
};
