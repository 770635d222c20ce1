import * as weldLog from '$lib/server/weld-log';
import * as drawings from '$lib/server/drawings';
import * as nde from '$lib/server/nde';
import type { PageServerLoad } from './$types';

export const load = (async ({ parent, url }) => {
	const { project } = await parent();
	const areas = drawings.areas(project.id);
	const asked = url.searchParams.get('area') ?? '';
	const area = areas.includes(asked) ? asked : undefined;
	return {
		title: `Progress · ${project.code}`,
		areas,
		progress: weldLog.progress(project.id, area),
		repairRates: nde.repairRates(project.id)
	};
}) satisfies PageServerLoad;
