import * as drawings from '$lib/server/drawings';
import { apiError } from '$lib/server/api';
import type { RequestHandler } from './$types';

/**
 * Asked by the upload middleware before it streams a file to disk: the hooks have already
 * checked that the caller may upload drawings to this project.
 */
export const GET: RequestHandler = ({ locals, url }) => {
	const drawingId = url.searchParams.get('drawing');
	if (drawingId && !drawings.get(locals.projectId!, Number(drawingId))) {
		return apiError(404, 'There is no such drawing in this project.');
	}
	return new Response(null, { status: 204 });
};
