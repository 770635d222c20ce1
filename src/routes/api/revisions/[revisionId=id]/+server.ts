import { json } from '@sveltejs/kit';
import * as drawings from '$lib/server/drawings';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = ({ params }) => {
	// The hooks have checked that the revision exists and the caller may read its project.
	return json(drawings.revisionJson(drawings.revision(Number(params.revisionId))!));
};
