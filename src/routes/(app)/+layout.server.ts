import { redirect } from '@sveltejs/kit';
import * as projects from '$lib/server/projects';
import type { LayoutServerLoad } from './$types';

/** Set once a person without a password has been asked to choose one, so it is asked once. */
const PASSWORD_ASKED = 'tacksheet-password-asked';

export const load = (async ({ locals, url, cookies }) => {
	// The hooks have already sent anyone signed out to the sign-in page.
	const user = locals.user!;
	// The first visit of an invited person (signed in by the invitation's link) asks for a password.
	if (!user.hasPassword && url.pathname !== '/account' && !cookies.get(PASSWORD_ASKED)) {
		cookies.set(PASSWORD_ASKED, '1', {
			path: '/',
			httpOnly: true,
			sameSite: 'lax',
			maxAge: 365 * 24 * 3600
		});
		redirect(303, `/account?welcome=1&returnTo=${encodeURIComponent(url.pathname)}`);
	}
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
