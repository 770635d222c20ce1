import { json } from '@sveltejs/kit';
import { acceptanceNotice } from '$lib/acceptance';
import * as criteriaSets from '$lib/server/criteria-sets';
import { apiError } from '$lib/server/api';
import type { RequestHandler } from './$types';

/**
 * One of the project's sets, at its latest version or at `?version=`, as a result judged by
 * it was: earlier versions never change.
 */
export const GET: RequestHandler = ({ params, url, locals }) => {
	const asked = url.searchParams.get('version');
	const version = asked === null ? undefined : Number(asked);
	if (version !== undefined && (!Number.isInteger(version) || version < 1)) {
		return apiError(400, 'version: give a whole number from 1.', 'version');
	}
	const set = criteriaSets.get(locals.projectId!, params.setId, version);
	if (!set) {
		return apiError(
			404,
			version === undefined
				? `This project has no criteria set "${params.setId}".`
				: `This project has no version ${version} of criteria set "${params.setId}".`
		);
	}
	const { limits, ...rest } = set;
	return json({ ...rest, limits: criteriaSets.limitsJson(limits), notice: acceptanceNotice });
};
