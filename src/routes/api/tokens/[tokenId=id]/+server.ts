import * as users from '$lib/server/users';
import { apiFailure } from '$lib/server/errors';
import type { RequestHandler } from './$types';

export const DELETE: RequestHandler = ({ locals, params }) => {
	try {
		users.revokeToken(locals.user!.id, Number(params.tokenId));
	} catch (error) {
		return apiFailure(error);
	}
	return new Response(null, { status: 204 });
};
