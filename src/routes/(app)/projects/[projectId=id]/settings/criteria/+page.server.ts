import * as criteriaSets from '$lib/server/criteria-sets';
import type { PageServerLoad } from './$types';

/** The project's own sets, each with the set it was derived from, for the list and the editor. */
export const load = (async ({ parent, locals }) => {
	const { project } = await parent();
	const projectId = locals.projectId!;
	const projectSets = criteriaSets.list(projectId).map((item) => ({
		...item,
		base: item.set.basedOn
			? (criteriaSets.resolve(projectId, item.set.basedOn.id, item.set.basedOn.version) ?? null)
			: null
	}));
	return { title: `Criteria sets · ${project.code}`, projectSets };
}) satisfies PageServerLoad;
