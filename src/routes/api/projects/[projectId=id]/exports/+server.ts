import { json } from '@sveltejs/kit';
import * as exports from '$lib/server/exports';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { exportRequestSchema } from '$lib/schemas/export';
import type { RequestHandler } from './$types';

/** Past and running turnover exports of the project, newest first. */
export const GET: RequestHandler = ({ locals }) => {
	return json({ items: exports.history(locals.projectId!) });
};

/**
 * Start a turnover set `{ scope: { all: true } | { drawings: [id] } | { area } | { system },
 * includeSuperseded?, acceptedOnly? }`: 202 `{ id }`, then poll `/api/exports/{id}`. The same
 * set while one is queued or running: 409 `{ error, id }` naming the running job.
 */
export const POST: RequestHandler = async ({ locals, request, url }) => {
	const body = await parseBody(request, exportRequestSchema);
	if ('response' in body) return body.response;
	try {
		const started = exports.start(locals.projectId!, body.data, locals.user!.id, url.origin);
		return json(
			{ id: started.id, url: `/api/exports/${started.id}` },
			{ status: 202, headers: { location: `/api/exports/${started.id}` } }
		);
	} catch (error) {
		return apiFailure(error);
	}
};
