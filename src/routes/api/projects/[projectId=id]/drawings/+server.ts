import { json } from '@sveltejs/kit';
import * as drawings from '$lib/server/drawings';
import * as staged from '$lib/server/staged-uploads';
import { apiError, invalid, queryOf } from '$lib/server/api';
import { drawingListQuery, newDrawingSchema } from '$lib/schemas/drawing';
import { apiFailure } from '$lib/server/errors';
import type { RequestHandler } from './$types';

/** The register: `?q=&kind=&area=&status=&sort=&dir=&page=&pageSize=`. */
export const GET: RequestHandler = ({ locals, url }) => {
	const query = drawingListQuery.safeParse(queryOf(url));
	if (!query.success) return invalid(query);
	const page = drawings.list(locals.projectId!, query.data);
	return json({
		...page,
		items: page.items.map(
			({ revisionId, revision, pageCount, sha256, issuedOn, uploadedAt, ...drawing }) => ({
				...drawing,
				currentRevision: revisionId
					? { id: revisionId, label: revision, pageCount, sha256, issuedOn, uploadedAt }
					: null
			})
		)
	});
};

/**
 * A new drawing with its first revision. The body reaches here as a staged file from the
 * upload middleware (multipart: number, title, kind, revision, file).
 */
export const POST: RequestHandler = async ({ locals, request }) => {
	const body = await request.json().catch(() => null);
	const file = staged.take(body?.staged);
	if (!file)
		return apiError(
			415,
			'Send the drawing as multipart/form-data, with the PDF in the "file" field.',
			'file'
		);
	const fields = newDrawingSchema.safeParse(body.fields ?? {});
	if (!fields.success) {
		staged.discard(file);
		return invalid(fields);
	}
	try {
		const created = await drawings.create(locals.projectId!, fields.data, file, locals.user!.id);
		const revision = drawings.revision(created.revisionId)!;
		return json(
			{ drawing: created.drawing, revision: drawings.revisionJson(revision) },
			{ status: 201 }
		);
	} catch (error) {
		return apiFailure(error);
	}
};
