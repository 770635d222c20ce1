import { json } from '@sveltejs/kit';
import { z } from 'zod';
import * as weldLog from '$lib/server/weld-log';
import { invalid } from '$lib/server/api';
import type { RequestHandler } from './$types';

const summaryQuery = z.object({
	include: z.enum(['drawings'], { error: 'include is "drawings" or left out.' }).optional()
});

/** Joints per state for the project and per area; `?include=drawings` adds each drawing. */
export const GET: RequestHandler = ({ locals, url }) => {
	const query = summaryQuery.safeParse({ include: url.searchParams.get('include') || undefined });
	if (!query.success) return invalid(query);
	return json(weldLog.summary(locals.projectId!, { drawings: query.data.include === 'drawings' }));
};
