import * as weldLog from '$lib/server/weld-log';
import * as drawings from '$lib/server/drawings';
import type { PageServerLoad } from './$types';

/** Only the filters' choices: the rows themselves are fetched by the page from the JSON API. */
export const load = (async ({ parent, url }) => {
	const { project } = await parent();
	const drawingId = Number(url.searchParams.get('drawing'));
	return {
		title: `Weld log · ${project.code}`,
		options: weldLog.filterOptions(project.id),
		drawing:
			Number.isInteger(drawingId) && drawingId > 0 ? drawings.picked(project.id, [drawingId]) : []
	};
}) satisfies PageServerLoad;
