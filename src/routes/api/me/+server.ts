import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

/** Who the caller is and their roles (session or API token). */
export const GET: RequestHandler = ({ locals }) => {
	const user = locals.user!;
	return json({
		id: user.id,
		email: user.email,
		name: user.name,
		// eslint-disable-next-line no-restricted-syntax -- the caller's own account, as stored
		isAdmin: user.isAdmin,
		roles: user.roles,
		via: user.tokenId ? 'token' : 'session'
	});
};
