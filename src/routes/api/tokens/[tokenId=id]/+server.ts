import { json } from '@sveltejs/kit';
import * as users from '$lib/server/users';
import type { RequestHandler } from './$types';

export const DELETE: RequestHandler = ({ locals, params }) => {
	try {
		users.revokeToken(locals.user!.id, Number(params.tokenId));
	} catch (error) {
		if (error instanceof users.AccountError)
			return json({ error: error.message }, { status: error.status });
		throw error;
	}
	return new Response(null, { status: 204 });
};
