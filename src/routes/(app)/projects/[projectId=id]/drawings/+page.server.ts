import * as drawings from '$lib/server/drawings';
import type { PageServerLoad } from './$types';

export const load = (async ({ parent }) => {
	const { project } = await parent();
	return { title: `Drawings · ${project.code}`, drawings: drawings.listWithCurrent(project.id) };
}) satisfies PageServerLoad;
