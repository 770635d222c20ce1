import { json } from '@sveltejs/kit';
import * as weldLog from '$lib/server/weld-log';
import { invalid, queryOf } from '$lib/server/api';
import { filled, weldLogQuery } from '$lib/schemas/weld-log';
import type { RequestHandler } from './$types';

/** The weld log, one page: `?state=&drawing=&area=&welder=&q=&sort=&dir=&page=&pageSize=`. */
export const GET: RequestHandler = ({ locals, url }) => {
	const query = weldLogQuery.safeParse(filled(queryOf(url)));
	if (!query.success) return invalid(query);
	return json(weldLog.list(locals.projectId!, query.data));
};
