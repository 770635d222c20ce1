import { json } from '@sveltejs/kit';
import * as sheetReadings from '$lib/server/sheet-readings';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { dismissSuggestionsSchema } from '$lib/schemas/joint';
import type { RequestHandler } from './$types';

/** Turn suggestions down (`{ numbers: [...] }` or `{ all: true }`) → `{ dismissed: n }`. */
export const POST: RequestHandler = async ({ params, request, locals }) => {
	const body = await parseBody(request, dismissSuggestionsSchema);
	if ('response' in body) return body.response;
	try {
		const dismissed = sheetReadings.dismiss(
			Number(params.revisionId),
			body.data.all ? 'all' : body.data.numbers!,
			locals.user!.id
		);
		return json({ dismissed });
	} catch (error) {
		return apiFailure(error);
	}
};
