import { json } from '@sveltejs/kit';
import * as nde from '$lib/server/nde';
import { invalid, queryOf } from '$lib/server/api';
import { lotsQuerySchema } from '$lib/schemas/nde';
import type { RequestHandler } from './$types';

/**
 * The project's NDE lots, open ones first: each with its welds, the sample asked and
 * reached, results, every welder's coverage and the tracers still open.
 * `?status=open|closed&stage=open|sampled|progressive|full|closed&q=&page=&pageSize=`
 */
export const GET: RequestHandler = ({ locals, url }) => {
	const query = lotsQuerySchema.safeParse(queryOf(url));
	if (!query.success) return invalid(query);
	return json({ ...nde.list(locals.projectId!, query.data), caution: nde.NDE_CAUTION });
};
