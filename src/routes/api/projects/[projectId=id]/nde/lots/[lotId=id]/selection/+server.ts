import { json } from '@sveltejs/kit';
import * as nde from '$lib/server/nde';
import { apiError } from '$lib/server/api';
import { parseBody } from '$lib/server/api-body';
import { apiFailure } from '$lib/server/errors';
import { commitSelectionSchema, seedSchema } from '$lib/schemas/nde';
import type { RequestHandler } from './$types';

/**
 * The selection a seed would draw now (`?seed=`; a fresh seed when left out), without
 * writing anything: the same candidates and seed always give the same selection.
 */
export const GET: RequestHandler = ({ locals, params, url }) => {
	const text = url.searchParams.get('seed');
	let seed: number | undefined;
	if (text !== null && text !== '') {
		const parsed = seedSchema.safeParse(Number(text));
		if (!parsed.success) return apiError(400, parsed.error.issues[0].message, 'seed');
		seed = parsed.data;
	}
	try {
		return json(nde.propose(locals.projectId!, Number(params.lotId), seed));
	} catch (error) {
		return apiFailure(error);
	}
};

/**
 * Commit a selection: `{ seed?, swaps?: [{ out, in, reason }] }` → 201 `{ seed, selected }`.
 * The seed draws it (a fresh one when left out) and is stored with it.
 */
export const POST: RequestHandler = async ({ locals, params, request }) => {
	const body = await parseBody(request, commitSelectionSchema);
	if ('response' in body) return body.response;
	try {
		const committed = nde.commit(
			locals.projectId!,
			Number(params.lotId),
			body.data,
			locals.user!.id
		);
		return json(committed, { status: 201 });
	} catch (error) {
		return apiFailure(error);
	}
};
