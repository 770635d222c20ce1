import * as weldLog from '$lib/server/weld-log';
import * as drawings from '$lib/server/drawings';
import { queryOf } from '$lib/server/api';
import { filled, weldLogQuery } from '$lib/schemas/weld-log';
import type { PageServerLoad } from './$types';

/**
 * The page of the weld log the address asks for: filters, sort and page live in the query
 * string, read with the same schema as the JSON API, so a shared link opens the same rows.
 */
export const load = (async ({ parent, url }) => {
	const { project } = await parent();
	const drawingId = Number(url.searchParams.get('drawing'));
	const query = weldLogQuery.safeParse(filled(queryOf(url)));
	return {
		title: `Weld log · ${project.code}`,
		options: weldLog.filterOptions(project.id),
		drawing:
			Number.isInteger(drawingId) && drawingId > 0 ? drawings.picked(project.id, [drawingId]) : [],
		log: query.success ? weldLog.list(project.id, query.data) : null,
		problem: query.success
			? null
			: (query.error.issues[0]?.message ?? 'The filters of the weld log are not valid.')
	};
}) satisfies PageServerLoad;
