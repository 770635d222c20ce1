import { z } from 'zod';
import * as counting from '$lib/server/state-counts';
import { invalid } from '$lib/server/api';
import type { RequestHandler } from './$types';

const summaryQuery = z.object({
	include: z.enum(['drawings'], { error: 'include is "drawings" or left out.' }).optional()
});

/**
 * Joints per state for the project and per area; `?include=drawings` adds each drawing,
 * written as JSON by SQLite from the kept counts.
 */
export const GET: RequestHandler = ({ locals, url }) => {
	const query = summaryQuery.safeParse({ include: url.searchParams.get('include') || undefined });
	if (!query.success) return invalid(query);
	const body = counting.summaryJson(locals.projectId!, {
		drawings: query.data.include === 'drawings'
	});
	return new Response(body, { headers: { 'content-type': 'application/json' } });
};
