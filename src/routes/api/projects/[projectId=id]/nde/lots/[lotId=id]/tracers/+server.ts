import { json } from '@sveltejs/kit';
import * as nde from '$lib/server/nde';
import { jointErrorResponse } from '$lib/server/joint-errors';
import type { RequestHandler } from './$types';

/** Pick again the tracers the lot was short of when a reject called them. */
export const POST: RequestHandler = ({ locals, params }) => {
	try {
		return json(nde.pickShortTracers(locals.projectId!, Number(params.lotId), locals.user!.id));
	} catch (error) {
		return jointErrorResponse(error);
	}
};
