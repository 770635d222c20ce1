import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { sendSignInLink } from '../../../../auth';
import * as users from '$lib/server/users';
import { formFailure } from '$lib/server/errors';
import * as projects from '$lib/server/projects';
import { inviteSchema } from '$lib/schemas/account';
import type { Actions, PageServerLoad } from './$types';

export const load = (async () => ({
	title: 'Users and roles',
	users: users.list(),
	projects: projects.list().map(({ id, code, name }) => ({ id, code, name })),
	form: await superValidate(zod4(inviteSchema))
})) satisfies PageServerLoad;

async function userAction(request: Request, run: (userId: string) => unknown) {
	const userId = String((await request.formData()).get('userId') ?? '');
	try {
		await run(userId);
	} catch (error) {
		return formFailure(error);
	}
	return null;
}

export const actions = {
	invite: async ({ request, locals, url }) => {
		const form = await superValidate(request, zod4(inviteSchema));
		if (!form.valid) return fail(400, { form });
		if (form.data.role && !form.data.projectId) {
			return message(form, 'Choose the project for that role, or leave the role empty.', {
				status: 400
			});
		}
		try {
			users.invite(form.data, locals.user!.id);
		} catch (error) {
			return formFailure(error, form);
		}
		await sendSignInLink(url.origin, form.data.email, 'invite');
		return message(form, `Invitation sent to ${form.data.email}.`);
	},
	disable: ({ request, locals }) =>
		userAction(request, (id) => users.setDisabled(id, true, locals.user!.id)),
	enable: ({ request, locals }) =>
		userAction(request, (id) => users.setDisabled(id, false, locals.user!.id)),
	reset: ({ request, locals, url }) =>
		userAction(request, async (id) => {
			const user = users.resetPassword(id, locals.user!.id);
			await sendSignInLink(url.origin, user.email, 'reset');
		})
} satisfies Actions;
