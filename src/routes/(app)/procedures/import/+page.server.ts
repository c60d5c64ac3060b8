import { fail, redirect } from '@sveltejs/kit';
import { failureStatus } from '$lib/result';
import { statusOf } from '$lib/server/http';
import { procedureEditors } from '$lib/procedures/access';
import { importFormSchema } from '$lib/schemas/procedure';
import { fieldErrors } from '$lib/schemas/form';
import { requireRole } from '$lib/server/auth';
import { readForm } from '$lib/server/request';
import { kindOf, previewImport, saveImport } from '$lib/server/procedure-import';
import type { Actions, PageServerLoad } from './$types';

const MAX_BYTES = 2_000_000;

export const load: PageServerLoad = async () => {
	requireRole(...procedureEditors);
	return {};
};

/** The file's text (a new upload) or the text sent back from the preview. */
async function contentOf(form: FormData) {
	const file = form.get('file');
	if (file instanceof File && file.size > 0) {
		if (file.size > MAX_BYTES) return { error: 'The file is over 2 MB.' };
		const content = await file.text();
		return { kind: kindOf(file.name, content), content, fileName: file.name };
	}
	const content = String(form.get('content') ?? '');
	const kind = String(form.get('kind') ?? '') || kindOf('', content);
	return { kind, content, fileName: String(form.get('fileName') ?? '') };
}

export const actions = {
	preview: async ({ request }) => {
		const user = requireRole(...procedureEditors);
		const read = await contentOf(await readForm(request));
		if ('error' in read) return fail(failureStatus.invalid, { errors: { file: read.error } });
		const parsed = importFormSchema.safeParse(read);
		if (!parsed.success)
			return fail(failureStatus.invalid, {
				errors: { file: fieldErrors(parsed.error).content ?? 'Choose a file.' }
			});
		const preview = await previewImport(user.shopId, parsed.data.kind, parsed.data.content);
		const payload = { preview, content: parsed.data.content, fileName: read.fileName };
		return preview.ok ? payload : fail(failureStatus.invalid, payload);
	},
	save: async ({ request }) => {
		const user = requireRole(...procedureEditors);
		const read = await contentOf(await readForm(request));
		if ('error' in read) return fail(failureStatus.invalid, { errors: { file: read.error } });
		const parsed = importFormSchema.safeParse(read);
		if (!parsed.success)
			return fail(failureStatus.invalid, { errors: { file: 'Choose a file to import.' } });
		const result = await saveImport(user.shopId, parsed.data.kind, parsed.data.content);
		if (!result.ok) {
			const preview = await previewImport(user.shopId, parsed.data.kind, parsed.data.content);
			return fail(statusOf(result), {
				preview: { ...preview, ok: false, problems: result.problems },
				content: parsed.data.content,
				fileName: read.fileName
			});
		}
		redirect(303, `/procedures?imported=${result.created.length}`);
	}
} satisfies Actions;
