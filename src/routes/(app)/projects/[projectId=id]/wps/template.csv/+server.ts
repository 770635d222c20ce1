import * as projects from '$lib/server/projects';
import { wpsCsvTemplate } from '$lib/wps-csv';
import type { RequestHandler } from './$types';

/** The WPS register's CSV template, in the project's units, with one invented example line. */
export const GET: RequestHandler = ({ locals }) =>
	new Response(wpsCsvTemplate(projects.unitsOf(locals.projectId!)), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': 'attachment; filename="wps-register-template.csv"'
		}
	});
