import * as nde from '$lib/server/nde';
import { can } from '$lib/permissions';
import { lotsQuerySchema } from '$lib/schemas/nde';
import { filled } from '$lib/schemas/weld-log';
import type { PageServerLoad } from './$types';

/** The project's NDE lots, a page at a time, with the one chosen (`?lot=`) in full. */
export const load = (({ locals, url }) => {
	const projectId = locals.projectId!;
	const params = filled(Object.fromEntries(url.searchParams));
	const parsed = lotsQuerySchema.safeParse(params);
	const query = parsed.success ? parsed.data : lotsQuerySchema.parse({});
	const lots = nde.list(projectId, query);
	const chosen = Number(url.searchParams.get('lot')) || lots.items[0]?.id;
	return {
		title: 'NDE lots',
		query,
		problem: parsed.success ? null : parsed.error.issues[0].message,
		lots,
		overview: nde.overview(projectId),
		requests: nde.requests(projectId, 5),
		lot: chosen ? (nde.detail(projectId, chosen) ?? null) : null,
		caution: nde.NDE_CAUTION,
		canSelect: can(locals.user!, 'nde.select', projectId),
		canManage: can(locals.user!, 'nde.lot.manage', projectId),
		canSettings: can(locals.user!, 'project.settings', projectId)
	};
}) satisfies PageServerLoad;
