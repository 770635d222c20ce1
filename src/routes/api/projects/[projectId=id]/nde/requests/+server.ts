import { json } from '@sveltejs/kit';
import * as nde from '$lib/server/nde';
import { apiError } from '$lib/server/api';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { sendRequestSchema } from '$lib/schemas/nde';
import type { RequestHandler } from './$types';

/** Requests sent to the NDE contractor, newest first, and how many welds are due for the next. */
export const GET: RequestHandler = ({ locals }) =>
	json({ items: nde.requests(locals.projectId!), due: nde.due(locals.projectId!).length });

/**
 * Send the selected welds waiting for NDE (of `lotIds`, or all) to the project's NDE
 * contractor as one e-mail: 201 `{ request, sentTo, lines }`; 409 with nothing to send or no
 * address; 502 when the mail server refuses it (nothing is then marked as requested).
 */
export const POST: RequestHandler = async ({ locals, request, url }) => {
	const body = await parseBody(request, sendRequestSchema);
	if ('response' in body) return body.response;
	try {
		const sent = await nde.sendRequest(locals.projectId!, body.data, locals.user!.id, url.origin);
		return json(sent, { status: 201 });
	} catch (error) {
		if (error instanceof nde.RequestNotSent) return apiError(502, error.message);
		return apiFailure(error);
	}
};
