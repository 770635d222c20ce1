import { json } from '@sveltejs/kit';
import * as nde from '$lib/server/nde';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { swapSchema } from '$lib/schemas/nde';
import type { RequestHandler } from './$types';

/** Swap a selected weld not yet examined for another of the lot: `{ out, in, reason }`. */
export const POST: RequestHandler = async ({ locals, params, request }) => {
	const body = await parseBody(request, swapSchema);
	if ('response' in body) return body.response;
	try {
		const selection = nde.swap(locals.projectId!, Number(params.lotId), body.data, locals.user!.id);
		return json({ selection });
	} catch (error) {
		return apiFailure(error);
	}
};
