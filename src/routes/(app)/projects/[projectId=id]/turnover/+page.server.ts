import * as exports from '$lib/server/exports';
import * as drawings from '$lib/server/drawings';
import * as scope from '$lib/server/export/scope';
import { exportRequestFromQuery } from '$lib/schemas/export';
import type { PageServerLoad } from './$types';

export const load = (async ({ parent, url }) => {
	const { project } = await parent();
	const parsed = exportRequestFromQuery(url.searchParams);
	return {
		title: `Turnover · ${project.code}`,
		request: parsed.success ? parsed.data : null,
		problem: parsed.success ? null : (parsed.error.issues[0]?.message ?? 'Choose a scope.'),
		preview: parsed.success ? exports.preview(project.id, parsed.data) : null,
		// The drawings chosen so far, for the picker's chips; others are searched as typed.
		choices: drawings.picked(project.id, parsed.success ? (parsed.data.scope.drawings ?? []) : []),
		areas: drawings.areas(project.id),
		systems: scope.systems(project.id),
		history: exports.history(project.id)
	};
}) satisfies PageServerLoad;
