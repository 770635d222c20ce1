import { json } from '@sveltejs/kit';
import * as wps from '$lib/server/wps';
import { parseBody } from '$lib/server/api-body';
import { wpsPatchSchema } from '$lib/schemas/wps';
import { apiError } from '$lib/server/api';
import { apiFailure } from '$lib/server/errors';
import type { RequestHandler } from './$types';

/** One WPS of the register. */
export const GET: RequestHandler = ({ params }) => {
	const found = wps.row(Number(params.wpsId));
	return found ? json(wps.wpsJson(found)) : apiError(404, 'There is no such WPS.');
};

/** Change a WPS: the fields that change and the `version` last read (409 when stale). */
export const PATCH: RequestHandler = async ({ locals, params, request }) => {
	const body = await parseBody(request, wpsPatchSchema);
	if ('response' in body) return body.response;
	try {
		const updated = wps.update(locals.projectId!, Number(params.wpsId), body.data, locals.user!.id);
		return json(wps.wpsJson(updated));
	} catch (error) {
		return apiFailure(error);
	}
};
