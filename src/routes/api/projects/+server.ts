import { json } from '@sveltejs/kit';
import * as projects from '$lib/server/projects';
import { roleIn } from '$lib/permissions';
import type { RequestHandler } from './$types';

/** The projects the caller belongs to (an administrator sees all). */
export const GET: RequestHandler = ({ locals }) => {
	const user = locals.user!;
	const rows = projects.visibleTo(user);
	return json(
		rows.map((p) => ({
			id: p.id,
			code: p.code,
			name: p.name,
			client: p.client,
			contractor: p.contractor,
			site: p.site,
			units: p.units,
			defaultCriteriaSet: p.defaultCriteriaSet,
			role: roleIn(user, p.id)
		}))
	);
};
