import { json } from '@sveltejs/kit';
import * as pins from '$lib/server/pins';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { movePinSchema } from '$lib/schemas/joint';
import type { RequestHandler } from './$types';

/** Move a pin `{ x, y, pageIndex?, version }`; 409 when the joint changed meanwhile. */
export const PATCH: RequestHandler = async ({ params, request, locals }) => {
	const body = await parseBody(request, movePinSchema);
	if ('response' in body) return body.response;
	try {
		return json(pins.move(Number(params.pinId), body.data, locals.user!.id));
	} catch (error) {
		return apiFailure(error);
	}
};
