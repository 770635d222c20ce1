import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import * as joints from '$lib/server/joints';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { updateJointSchema } from '$lib/schemas/joint';
import type { RequestHandler } from './$types';

/** The joint with its state, next step, pins and history. */
export const GET: RequestHandler = ({ params }) => json(joints.detail(Number(params.jointId)));

/** Change the joint card's fields; `version` is the one the client last saw. */
export const PATCH: RequestHandler = async ({ params, request, locals }) => {
	const body = await parseBody(request, updateJointSchema);
	if ('response' in body) return body.response;
	try {
		joints.update(Number(params.jointId), body.data, locals.user!.id);
		return json(joints.detail(Number(params.jointId)));
	} catch (error) {
		return apiFailure(error);
	}
};

/**
 * Take back a joint placed by mistake in the last minutes, with no record on it: 204, its
 * number free again; 409 once it has a record or the time is up. `?version=` is optional.
 */
export const DELETE: RequestHandler = ({ params, url, locals }) => {
	const given = url.searchParams.get('version');
	const version = given === null ? undefined : Number(given);
	if (version !== undefined && !(Number.isInteger(version) && version >= 1))
		return apiError(400, 'version: the joint version is a whole number from 1.', 'version');
	try {
		joints.takeBack(Number(params.jointId), version, locals.user!.id);
		return new Response(null, { status: 204 });
	} catch (error) {
		return apiFailure(error);
	}
};
