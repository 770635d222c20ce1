import { json } from '@sveltejs/kit';
import * as joints from '$lib/server/joints';
import * as pins from '$lib/server/pins';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { createPinSchema } from '$lib/schemas/joint';
import type { RequestHandler } from './$types';

/** Every pin on the revision, at its PDF user-space point, with its joint's state. */
export const GET: RequestHandler = ({ params }) =>
	json(
		{ items: pins.ofRevision(Number(params.revisionId)) },
		{ headers: { 'cache-control': 'no-store' } }
	);

/** Place a pin: a new joint at that point, numbered by the project's rule unless given. */
export const POST: RequestHandler = async ({ params, request, locals }) => {
	const body = await parseBody(request, createPinSchema);
	if ('response' in body) return body.response;
	try {
		const { joint, pin } = joints.place(
			{ revisionId: Number(params.revisionId), ...body.data },
			locals.user!.id
		);
		return json({ joint: joints.detail(joint.id), pin }, { status: 201 });
	} catch (error) {
		return apiFailure(error);
	}
};
