import { json } from '@sveltejs/kit';
import * as welds from '$lib/server/welds';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { recordWeldSchema } from '$lib/schemas/inspection';
import type { RequestHandler } from './$types';

/** The joint's welds (original, R1, R2 …) with the welder stamp of each pass. */
export const GET: RequestHandler = ({ params }) =>
	json({ welds: welds.list(Number(params.jointId)) });

/** Record a weld with its stamps; each welder's qualification and continuity are checked. */
export const POST: RequestHandler = async ({ params, request, locals }) => {
	const body = await parseBody(request, recordWeldSchema);
	if ('response' in body) return body.response;
	const user = locals.user!;
	try {
		const recorded = welds.record(Number(params.jointId), body.data, user);
		return json(recorded, { status: 201 });
	} catch (error) {
		return apiFailure(error);
	}
};
