import { json } from '@sveltejs/kit';
import * as joints from '$lib/server/joints';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { cutOutSchema } from '$lib/schemas/joint';
import type { RequestHandler } from './$types';

/**
 * Cut out a welded joint `{ reason, version }`: it is voided, and a new joint with the
 * N-suffixed number is pinned at the same point, awaiting fit-up. Answers the new joint.
 */
export const POST: RequestHandler = async ({ params, request, locals }) => {
	const body = await parseBody(request, cutOutSchema);
	if ('response' in body) return body.response;
	try {
		const { voided, joint } = joints.cutOut(
			Number(params.jointId),
			body.data.reason,
			body.data.version,
			locals.user!.id
		);
		return json(
			{ joint: joints.detail(joint.id), replaced: { id: voided.id, number: voided.number } },
			{ status: 201 }
		);
	} catch (error) {
		return apiFailure(error);
	}
};
