import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import * as users from '$lib/server/users';
import { signInWithPassword } from '../../../auth';
import { formFailure } from '$lib/server/errors';
import * as projects from '$lib/server/projects';
import { changePasswordSchema } from '$lib/schemas/account';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ locals }) => {
	const user = locals.user!;
	const memberOf = projects.list(Object.keys(user.roles).map(Number));
	return {
		title: 'Your account',
		hasPassword: user.hasPassword,
		memberships: memberOf.map((p) => ({
			id: p.id,
			code: p.code,
			name: p.name,
			role: user.roles[p.id]
		})),
		form: await superValidate(zod4(changePasswordSchema))
	};
}) satisfies PageServerLoad;

export const actions = {
	password: async (event) => {
		const { request, locals } = event;
		const form = await superValidate(request, zod4(changePasswordSchema));
		const clear = () => Object.assign(form.data, { current: '', password: '', confirm: '' });
		if (!form.valid) {
			clear();
			return message(form, 'The new password was not changed.', { status: 400 });
		}
		try {
			await users.changePassword(locals.user!.id, form.data.current, form.data.password);
		} catch (error) {
			clear();
			return formFailure(error, form);
		}
		// The change ended every session, this one too: sign this one in again under the new password.
		const signedIn = await signInWithPassword(event, locals.user!.email, form.data.password);
		clear();
		return message(
			form,
			signedIn
				? 'Your new password is set. Any other session of yours has been signed out.'
				: 'Your new password is set. Sign in again with it.'
		);
	}
} satisfies Actions;
