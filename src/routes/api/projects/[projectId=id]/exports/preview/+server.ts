import { json } from '@sveltejs/kit';
import * as exports from '$lib/server/exports';
import { invalid } from '$lib/server/api';
import { exportRequestFromQuery } from '$lib/schemas/export';
import type { RequestHandler } from './$types';

/**
 * What a turnover set would hold, before it is started:
 * `?scope=all|drawings|area|system&drawing=…&area=…&system=…&superseded=1&accepted=1`.
 */
export const GET: RequestHandler = ({ locals, url }) => {
	const parsed = exportRequestFromQuery(url.searchParams);
	if (!parsed.success) return invalid(parsed);
	return json(exports.preview(locals.projectId!, parsed.data));
};
