import { json } from '@sveltejs/kit';
import { z } from 'zod';
import * as weldLog from '$lib/server/weld-log';
import { invalid } from '$lib/server/api';
import type { RequestHandler } from './$types';

const progressQuery = z.object({
	area: z.string().trim().max(80, { error: 'An area has at most 80 characters.' }).optional()
});

/** Joints accepted per day and in all, against the live joints: `?area=` for one area. */
export const GET: RequestHandler = ({ locals, url }) => {
	const query = progressQuery.safeParse({ area: url.searchParams.get('area') || undefined });
	if (!query.success) return invalid(query);
	return json(weldLog.progress(locals.projectId!, query.data.area));
};
