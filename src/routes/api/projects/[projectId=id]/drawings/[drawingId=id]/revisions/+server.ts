import { json } from '@sveltejs/kit';
import * as drawings from '$lib/server/drawings';
import * as sheetReadings from '$lib/server/sheet-readings';
import * as staged from '$lib/server/staged-uploads';
import { apiError, invalid } from '$lib/server/api';
import { newRevisionSchema } from '$lib/schemas/drawing';
import { apiFailure } from '$lib/server/errors';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = ({ params }) =>
	json({ items: drawings.history(Number(params.drawingId)) });

/** A new revision (multipart: label, note, file); the previous one is then superseded. */
export const POST: RequestHandler = async ({ locals, params, request }) => {
	const body = await request.json().catch(() => null);
	const file = staged.take(body?.staged);
	if (!file)
		return apiError(
			415,
			'Send the revision as multipart/form-data, with the PDF in the "file" field.',
			'file'
		);
	const fields = newRevisionSchema.safeParse(body.fields ?? {});
	if (!fields.success) {
		staged.discard(file);
		return invalid(fields);
	}
	try {
		const created = await drawings.addRevision(
			locals.projectId!,
			Number(params.drawingId),
			fields.data,
			file,
			locals.user!.id
		);
		const revision = drawings.revision(created.revisionId)!;
		// The pins go over flagged; the reading of the new sheets (a few seconds) says which
		// stayed in place, which moved with their number and which are flagged for review.
		const read = await sheetReadings.settle(created.revisionId, sheetReadings.UPLOAD_WAIT_MS);
		return json(
			{
				revision: drawings.revisionJson(revision),
				superseded: created.superseded,
				pinsCarried: created.pinsCarried,
				...sheetReadings.carried(created.revisionId),
				reading: read ? (sheetReadings.reading(created.revisionId)?.status ?? 'none') : 'running'
			},
			{ status: 201 }
		);
	} catch (error) {
		return apiFailure(error);
	}
};
