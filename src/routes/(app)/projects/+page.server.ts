import * as projects from '$lib/server/projects';
import type { PageServerLoad } from './$types';

export const load = (async ({ parent }) => {
	const { projects: visible } = await parent();
	const rows = projects.list(visible.map((p) => p.id));
	const counts = projects.stateCounts(rows.map((p) => p.id));
	return {
		title: 'Projects',
		cards: rows.map((p) => ({
			id: p.id,
			code: p.code,
			name: p.name,
			client: p.client,
			contractor: p.contractor,
			site: p.site,
			units: p.units,
			counts: counts.get(p.id)!
		}))
	};
}) satisfies PageServerLoad;
