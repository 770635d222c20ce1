import { json } from '@sveltejs/kit';
import * as outstanding from '$lib/server/outstanding';
import { invalid, queryOf } from '$lib/server/api';
import { outstandingQuerySchema } from '$lib/schemas/outstanding';
import type { RequestHandler } from './$types';

/**
 * Joint counts by state and area, system, drawing; what each role owes, oldest first.
 * With `list=<state>` only that owed list, from `offset`: the board's "show more".
 */
export const GET: RequestHandler = ({ locals, url }) => {
	const query = outstandingQuerySchema.safeParse(queryOf(url));
	if (!query.success) return invalid(query);
	if (query.data.list) {
		return json(outstanding.owedList(locals.projectId!, query.data.list, query.data));
	}
	return json(outstanding.board(locals.projectId!, query.data));
};
