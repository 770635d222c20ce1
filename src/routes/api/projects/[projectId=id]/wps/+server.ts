import { json } from '@sveltejs/kit';
import * as wps from '$lib/server/wps';
import { parseBody } from '$lib/server/api-body';
import { wpsSchema } from '$lib/schemas/wps';
import { apiFailure } from '$lib/server/errors';
import type { RequestHandler } from './$types';

/** The project's WPS register, by number and revision. */
export const GET: RequestHandler = ({ locals }) =>
	json({ items: wps.list(locals.projectId!).map(wps.wpsJson) });

/**
 * Add a WPS: its fields as typed in the project's units (lists as text or arrays). A number
 * and revision already in the register is a 409; a field that cannot be read, a 400 naming it.
 */
export const POST: RequestHandler = async ({ locals, request }) => {
	const body = await parseBody(request, wpsSchema);
	if ('response' in body) return body.response;
	try {
		const created = wps.create(locals.projectId!, body.data, locals.user!.id);
		return json(wps.wpsJson(created), { status: 201 });
	} catch (error) {
		return apiFailure(error);
	}
};
