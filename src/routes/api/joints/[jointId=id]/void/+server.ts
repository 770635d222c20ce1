import { json } from '@sveltejs/kit';
import * as joints from '$lib/server/joints';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { voidJointSchema } from '$lib/schemas/joint';
import type { RequestHandler } from './$types';

/** Void a joint `{ reason, version }`: it stays in the log, greyed; its number is never reused. */
export const POST: RequestHandler = async ({ params, request, locals }) => {
	const body = await parseBody(request, voidJointSchema);
	if ('response' in body) return body.response;
	try {
		joints.voidJoint(Number(params.jointId), body.data.reason, body.data.version, locals.user!.id);
		return json(joints.detail(Number(params.jointId)));
	} catch (error) {
		return apiFailure(error);
	}
};
