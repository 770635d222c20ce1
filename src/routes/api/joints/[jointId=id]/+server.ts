import { json } from '@sveltejs/kit';
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
