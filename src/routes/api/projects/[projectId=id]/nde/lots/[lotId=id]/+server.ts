import { json } from '@sveltejs/kit';
import * as nde from '$lib/server/nde';
import { apiError } from '$lib/server/api';
import type { RequestHandler } from './$types';

/** One lot in full: its figures, each weld and how it stands, its rounds with their seeds, its tracer calls. */
export const GET: RequestHandler = ({ locals, params }) => {
	const lot = nde.detail(locals.projectId!, Number(params.lotId));
	if (!lot) return apiError(404, 'There is no such lot.');
	return json({ ...lot, caution: nde.NDE_CAUTION });
};
