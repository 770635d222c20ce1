import { redirect } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';

export const load = (async ({ parent }) => {
	const { projects } = await parent();
	redirect(303, projects.length === 1 ? `/projects/${projects[0].id}` : '/projects');
}) satisfies PageServerLoad;
