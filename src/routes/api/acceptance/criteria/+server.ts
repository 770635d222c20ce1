import { json } from '@sveltejs/kit';
import { acceptanceNotice, criteriaSets } from '$lib/acceptance';
import { limitsJson } from '$lib/server/criteria-sets';
import type { RequestHandler } from './$types';

/** The built-in criteria sets, each limit with its clause, how sure we are of it, and where it applies. */
export const GET: RequestHandler = () => {
	const items = criteriaSets.map(({ limits, ...set }) => ({ ...set, limits: limitsJson(limits) }));
	return json({ items, notice: acceptanceNotice });
};
