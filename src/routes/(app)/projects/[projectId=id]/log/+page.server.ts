import * as weldLog from '$lib/server/weld-log';
import type { PageServerLoad } from './$types';

/** Only the filters' choices: the rows themselves are fetched by the page from the JSON API. */
export const load = (async ({ parent }) => {
	const { project } = await parent();
	return { title: `Weld log · ${project.code}`, options: weldLog.filterOptions(project.id) };
}) satisfies PageServerLoad;
