import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import * as users from '$lib/server/users';
import { formFailure } from '$lib/server/errors';
import { tokenCreateSchema } from '$lib/schemas/account';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ locals }) => ({
	title: 'API tokens',
	tokens: users.tokens(locals.user!.id),
	form: await superValidate(zod4(tokenCreateSchema))
})) satisfies PageServerLoad;

export const actions = {
	create: async ({ request, locals }) => {
		const form = await superValidate(request, zod4(tokenCreateSchema));
		if (!form.valid) return fail(400, { form });
		const created = users.createToken(locals.user!.id, form.data.name);
		form.data.name = '';
		return message(form, created.token);
	},
	revoke: async ({ request, locals }) => {
		const id = Number((await request.formData()).get('id'));
		try {
			users.revokeToken(locals.user!.id, id);
		} catch (error) {
			return formFailure(error);
		}
		return { revoked: id };
	}
} satisfies Actions;
