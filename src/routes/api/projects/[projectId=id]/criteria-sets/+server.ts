import { json } from '@sveltejs/kit';
import { acceptanceNotice, builtInCriteriaSetIds } from '$lib/acceptance';
import * as criteriaSets from '$lib/server/criteria-sets';
import { parseBody } from '$lib/server/api-body';
import { criteriaSetSchema } from '$lib/schemas/criteria-set';
import { apiFailure } from '$lib/server/errors';
import type { RequestHandler } from './$types';

/** The project's own criteria sets at their latest versions, with base, versions and limits. */
export const GET: RequestHandler = ({ locals }) =>
	json({
		items: criteriaSets.list(locals.projectId!).map(criteriaSets.projectSetJson),
		builtIn: builtInCriteriaSetIds,
		notice: acceptanceNotice
	});

/**
 * Derive a set (`base`) or revise one (`revises`: the version the change was made on); the
 * limits are typed in the project's units. Administrators only (the hooks check).
 */
export const POST: RequestHandler = async ({ request, locals }) => {
	const body = await parseBody(request, criteriaSetSchema);
	if ('response' in body) return body.response;
	const projectId = locals.projectId!;
	try {
		const { created, set } = criteriaSets.save(projectId, body.data, locals.user!.id);
		const saved = criteriaSets.list(projectId).find((item) => item.set.id === set.id)!;
		return json(criteriaSets.projectSetJson(saved), { status: created ? 201 : 200 });
	} catch (error) {
		return apiFailure(error);
	}
};
