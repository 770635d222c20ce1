import { json } from '@sveltejs/kit';
import * as inspections from '$lib/server/inspections';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { recordInspectionSchema } from '$lib/schemas/inspection';
import { acceptanceNotice } from '$lib/acceptance';
import type { RequestHandler } from './$types';

/** The joint's inspection records, newest first, corrections and the rows they replace alike. */
export const GET: RequestHandler = ({ params }) =>
	json({ inspections: inspections.list(Number(params.jointId)), notice: acceptanceNotice });

/**
 * Record a fit-up, visual or NDE result, signed by the caller (the hooks let inspectors only).
 * The server judges the readings itself and stores its own verdict beside the decision.
 */
export const POST: RequestHandler = async ({ params, request, locals }) => {
	const body = await parseBody(request, recordInspectionSchema);
	if ('response' in body) return body.response;
	try {
		const recorded = inspections.record(Number(params.jointId), body.data, locals.user!.id);
		return json(recorded, { status: 201 });
	} catch (error) {
		return apiFailure(error);
	}
};
