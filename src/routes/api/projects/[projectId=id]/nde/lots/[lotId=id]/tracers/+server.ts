import { json } from '@sveltejs/kit';
import * as nde from '$lib/server/nde';
import { apiFailure } from '$lib/server/errors';
import type { RequestHandler } from './$types';

/** Pick again the tracers the lot was short of when a reject called them. */
export const POST: RequestHandler = ({ locals, params }) => {
	try {
		return json(nde.pickShortTracers(locals.projectId!, Number(params.lotId), locals.user!.id));
	} catch (error) {
		return apiFailure(error);
	}
};
