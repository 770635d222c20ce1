import * as projects from '$lib/server/projects';
import type { PageServerLoad } from './$types';

export const load = (async ({ parent }) => {
	const { project } = await parent();
	return {
		title: project.code,
		counts: projects.stateCounts([project.id]).get(project.id)!,
		areas: projects.stateCountsByArea(project.id),
		pinsToReview: projects.pinsToReview(project.id)
	};
}) satisfies PageServerLoad;
