import { json } from '@sveltejs/kit';
import { z } from 'zod';
import * as photos from '$lib/server/photos';
import * as staged from '$lib/server/staged-uploads';
import { apiError, invalid } from '$lib/server/api';
import { apiFailure } from '$lib/server/errors';
import { text } from '$lib/schemas/text';
import type { RequestHandler } from './$types';

const photoFields = z.object({ caption: text('The caption', photos.CAPTION_MAX).default('') });

/** The inspection's photos, oldest first. */
export const GET: RequestHandler = ({ params }) => {
	const id = Number(params.inspectionId);
	return json({ photos: photos.byInspection([id]).get(id) ?? [] });
};

/**
 * Attach a photo (multipart: `file`, `caption?`), streamed to disk by the upload middleware
 * and handed over here as a staged file. Not a photo → 415; over PHOTO_MAX_MB → 413 (the
 * middleware); nothing is kept on a refusal.
 */
export const POST: RequestHandler = async ({ params, request, locals }) => {
	const body = await request.json().catch(() => null);
	const file = staged.take(body?.staged);
	if (!file)
		return apiError(
			415,
			'Send the photo as multipart/form-data, with the image in the "file" field.',
			'file'
		);
	const fields = photoFields.safeParse(body.fields ?? {});
	if (!fields.success) {
		staged.discard(file);
		return invalid(fields);
	}
	try {
		const photo = await photos.attach(
			Number(params.inspectionId),
			file,
			fields.data.caption,
			locals.user!.id
		);
		const { id, sha256, bytes, width, height, caption } = photo;
		return json({ photo: { id, sha256, bytes, width, height, caption } }, { status: 201 });
	} catch (error) {
		return apiFailure(error);
	}
};
