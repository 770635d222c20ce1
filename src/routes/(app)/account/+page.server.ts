import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import * as users from '$lib/server/users';
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
	password: async ({ request, locals }) => {
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
		clear();
		return message(form, 'Your new password is set.');
	}
} satisfies Actions;
