import { json } from '@sveltejs/kit';
import * as inspectionRequests from '$lib/server/inspection-requests';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { inspectionRequestSchema } from '$lib/schemas/outstanding';
import type { RequestHandler } from './$types';

/** The project's requests, oldest first, with how long each waited; `?open=1` for open ones. */
export const GET: RequestHandler = ({ locals, url }) =>
	json({
		items: inspectionRequests.list(locals.projectId!, {
			open: url.searchParams.get('open') === '1'
		})
	});

/** Call a hold point: one request per joint, one e-mail per batch to each project inspector. */
export const POST: RequestHandler = async ({ locals, request, url }) => {
	const body = await parseBody(request, inspectionRequestSchema);
	if ('response' in body) return body.response;
	const projectId = locals.projectId!;
	const userId = locals.user!.id;
	let created: inspectionRequests.CreatedBatch;
	try {
		created = inspectionRequests.create(projectId, body.data, userId);
	} catch (error) {
		return apiFailure(error);
	}
	let notified: string[] = [];
	let mailError: string | undefined;
	try {
		notified = await inspectionRequests.notify(
			projectId,
			created,
			body.data.stage,
			userId,
			url.origin
		);
	} catch (error) {
		mailError = `The requests are on the board, but the e-mail to the inspectors failed: ${error instanceof Error ? error.message : String(error)}`;
	}
	return json({ ...created, notified, ...(mailError ? { mailError } : {}) }, { status: 201 });
};
