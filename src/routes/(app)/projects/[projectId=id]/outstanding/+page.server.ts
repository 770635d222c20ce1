import { can } from '$lib/permissions';
import type { PageServerLoad } from './$types';

/** The board's data comes from its API on the client; the page only knows what the caller may do. */
export const load = (({ locals }) => ({
	title: 'Outstanding',
	canRequest: can(locals.user!, 'inspection.request', locals.projectId!)
})) satisfies PageServerLoad;
