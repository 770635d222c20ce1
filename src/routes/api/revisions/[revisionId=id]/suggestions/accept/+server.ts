import { json } from '@sveltejs/kit';
import * as sheetReadings from '$lib/server/sheet-readings';
import * as joints from '$lib/server/joints';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { acceptSuggestionsSchema } from '$lib/schemas/joint';
import type { RequestHandler } from './$types';

/**
 * Accept suggestions (`{ numbers: [...] }` or `{ all: true }`, with `joint` defaults): a joint
 * and pin for each, all or nothing → 201 `{ items: [{ joint, pin }] }`.
 */
export const POST: RequestHandler = async ({ params, request, locals }) => {
	const body = await parseBody(request, acceptSuggestionsSchema);
	if ('response' in body) return body.response;
	try {
		const made = sheetReadings.accept(
			Number(params.revisionId),
			body.data.all ? 'all' : body.data.numbers!,
			body.data.joint,
			locals.user!.id
		);
		return json(
			{ items: made.map(({ joint, pin }) => ({ joint: joints.detail(joint.id), pin })) },
			{ status: 201 }
		);
	} catch (error) {
		return apiFailure(error);
	}
};
