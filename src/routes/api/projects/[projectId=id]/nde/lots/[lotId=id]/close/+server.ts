import { json } from '@sveltejs/kit';
import * as nde from '$lib/server/nde';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { closeLotSchema } from '$lib/schemas/nde';
import type { RequestHandler } from './$types';

/** Close a lot (QC manager): it takes no more welds; `{ note? }`. */
export const POST: RequestHandler = async ({ locals, params, request }) => {
	const body = await parseBody(request, closeLotSchema);
	if ('response' in body) return body.response;
	try {
		const lot = nde.close(locals.projectId!, Number(params.lotId), body.data.note, locals.user!.id);
		return json({ lot });
	} catch (error) {
		return apiFailure(error);
	}
};
