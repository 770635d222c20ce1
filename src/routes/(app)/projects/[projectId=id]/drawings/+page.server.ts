import { error } from '@sveltejs/kit';
import * as drawings from '$lib/server/drawings';
import { queryOf } from '$lib/server/api';
import { drawingListQuery } from '$lib/schemas/drawing';
import { can } from '$lib/permissions';
import type { PageServerLoad } from './$types';

export const load = (async ({ locals, url, parent }) => {
	const { project } = await parent();
	const parsed = drawingListQuery.safeParse(queryOf(url));
	if (!parsed.success) error(400, parsed.error.issues[0]?.message ?? 'The search is not valid.');
	const query = parsed.data;
	const page = drawings.list(project.id, query);
	const history = drawings.historyFor(page.items.map((item) => item.id));
	return {
		title: `Drawings · ${project.code}`,
		query,
		...page,
		items: page.items.map((item) => ({ ...item, history: history.get(item.id) ?? [] })),
		areas: drawings.areas(project.id),
		canUpload: can(locals.user!, 'drawing.upload', project.id),
		canEdit: can(locals.user!, 'drawing.edit', project.id)
	};
}) satisfies PageServerLoad;
