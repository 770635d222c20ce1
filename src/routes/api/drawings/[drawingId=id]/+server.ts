import { json } from '@sveltejs/kit';
import * as drawings from '$lib/server/drawings';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { updateDrawingSchema } from '$lib/schemas/drawing';
import type { RequestHandler } from './$types';

/** The drawing's register data with its `version`. */
export const GET: RequestHandler = ({ params, locals }) =>
	json(drawings.get(locals.projectId!, Number(params.drawingId)));

/**
 * Change the register data (number, title, kind, line, area, system) with the `version` last
 * seen: a stale version or a number another drawing has → 409. Audited.
 */
export const PATCH: RequestHandler = async ({ params, request, locals }) => {
	const body = await parseBody(request, updateDrawingSchema);
	if ('response' in body) return body.response;
	try {
		return json(
			drawings.update(locals.projectId!, Number(params.drawingId), body.data, locals.user!.id)
		);
	} catch (error) {
		return apiFailure(error);
	}
};
