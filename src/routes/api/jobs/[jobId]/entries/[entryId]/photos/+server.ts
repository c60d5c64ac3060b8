import { error, json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth';
import { orError } from '$lib/server/http';
import { attachPhoto } from '$lib/server/photos';
import { MAX_PHOTO_BYTES, isTooLarge } from '$lib/uploads/check';
import type { RequestHandler } from './$types';

/** Attaches a photo (multipart field `photo`) to an entry of the job. */
export const POST: RequestHandler = async ({ params, request }) => {
	const user = requireRole('technician', 'foreman', 'owner');
	let form: FormData;
	try {
		form = await request.formData();
	} catch (e) {
		if (isTooLarge(e)) error(413, 'The photo is larger than 10 MB.');
		error(400, 'Send the photo as multipart form data in the field "photo".');
	}
	const file = form.get('photo');
	if (!(file instanceof File)) error(400, 'Choose a photo to attach.');
	if (file.size > MAX_PHOTO_BYTES) error(400, 'The photo is larger than 10 MB.');
	const bytes = new Uint8Array(await file.arrayBuffer());
	const { entry } = orError(
		await attachPhoto(user, params.jobId, params.entryId, { bytes, name: file.name })
	);
	return json({ entry }, { status: 201 });
};
