import { json } from '@sveltejs/kit';
import * as welders from '$lib/server/welders';
import { parseBody } from '$lib/server/api-body';
import { welderSchema } from '$lib/schemas/outstanding';
import { apiFailure } from '$lib/server/errors';
import type { RequestHandler } from './$types';

/**
 * The project's welders with their stamps, processes and continuity, their weld record and
 * repair rate, and the qualifications that lapse within 30 days.
 */
export const GET: RequestHandler = ({ locals }) => json(welders.register(locals.projectId!));

/** Add a welder with any process qualifications; a stamp already used here is a 409. */
export const POST: RequestHandler = async ({ locals, request }) => {
	const body = await parseBody(request, welderSchema);
	if ('response' in body) return body.response;
	try {
		const welder = welders.create(locals.projectId!, body.data, locals.user!.id);
		const item = welders.list(locals.projectId!).find((w) => w.id === welder.id);
		return json({ welder: item }, { status: 201 });
	} catch (error) {
		return apiFailure(error);
	}
};
