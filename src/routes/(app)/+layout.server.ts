import * as projects from '$lib/server/projects';
import type { LayoutServerLoad } from './$types';

export const load = (async ({ locals }) => {
	// The hooks have already sent anyone signed out to the sign-in page.
	const user = locals.user!;
	const visible = projects.visibleTo(user);
	return {
		user: {
			id: user.id,
			name: user.name,
			email: user.email,
			// eslint-disable-next-line no-restricted-syntax -- the principal goes to the browser, where can() runs too
			isAdmin: user.isAdmin,
			roles: user.roles
		},
		projects: visible.map(({ id, code, name, units }) => ({ id, code, name, units }))
	};
}) satisfies LayoutServerLoad;
