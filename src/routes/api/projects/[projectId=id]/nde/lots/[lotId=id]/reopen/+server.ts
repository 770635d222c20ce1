import { json } from '@sveltejs/kit';
import * as nde from '$lib/server/nde';
import { apiFailure } from '$lib/server/errors';
import type { RequestHandler } from './$types';

/** Reopen a closed lot (QC manager), while no later lot of its grouping has taken welds. */
export const POST: RequestHandler = ({ locals, params }) => {
	try {
		return json({ lot: nde.reopen(locals.projectId!, Number(params.lotId), locals.user!.id) });
	} catch (error) {
		return apiFailure(error);
	}
};
