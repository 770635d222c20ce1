import { error } from '@sveltejs/kit';
import * as projects from '$lib/server/projects';
import type { LayoutServerLoad } from './$types';

export const load = (async ({ locals }) => {
	// Membership and permission were checked in the hooks, which set locals.projectId.
	const project = projects.get(locals.projectId!);
	if (!project) error(404, 'There is no such project.');
	return { project };
}) satisfies LayoutServerLoad;
