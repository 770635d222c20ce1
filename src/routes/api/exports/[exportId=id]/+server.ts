import { json } from '@sveltejs/kit';
import * as exports from '$lib/server/exports';
import { apiError } from '$lib/server/api';
import { apiFailure } from '$lib/server/errors';
import type { RequestHandler } from './$types';

/** `{ id, status, progress: 0..1, current?, report: [...], fileUrl? … }` of one export. */
export const GET: RequestHandler = ({ params }) => {
	const found = exports.status(Number(params.exportId));
	return found ? json(found) : apiError(404, 'There is no such export.');
};

/** Cancel a queued or running export; a finished one answers 409. */
export const DELETE: RequestHandler = ({ params, locals }) => {
	try {
		return json(exports.cancel(Number(params.exportId), locals.user!.id));
	} catch (error) {
		return apiFailure(error);
	}
};
