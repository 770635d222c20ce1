import { json } from '@sveltejs/kit';
import * as pins from '$lib/server/pins';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { reviewPinSchema } from '$lib/schemas/joint';
import type { RequestHandler } from './$types';

/** Confirm a pin carried to a new revision: the joint is still where it was. */
export const POST: RequestHandler = async ({ params, request, locals }) => {
	const body = await parseBody(request, reviewPinSchema);
	if ('response' in body) return body.response;
	try {
		return json(pins.confirm(Number(params.pinId), body.data.version, locals.user!.id));
	} catch (error) {
		return apiFailure(error);
	}
};
