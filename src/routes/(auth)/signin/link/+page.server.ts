import { redirect } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { sendSignInLink } from '../../../../auth';
import * as guard from '$lib/server/sign-in-guard';
import { linkRequestSchema } from '$lib/schemas/account';
import { safeReturnTo } from '$lib/return-to';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ url }) => ({
	title: 'E-mail me a sign-in link',
	form: await superValidate(zod4(linkRequestSchema)),
	returnTo: safeReturnTo(url.searchParams.get('returnTo'))
})) satisfies PageServerLoad;

export const actions = {
	default: async (event) => {
		const form = await superValidate(event.request, zod4(linkRequestSchema));
		if (!form.valid)
			return message(form, 'Enter the e-mail address of your account.', { status: 400 });
		// Links are rationed like passwords: a flood of requests is refused the same way.
		const attempt = { email: form.data.email, client: event.getClientAddress() };
		const verdict = guard.check(attempt);
		if (!verdict.allowed) {
			guard.refused(attempt);
			return message(form, 'Too many requests. Wait a few minutes and try again.', { status: 429 });
		}
		// Over the limit for this address or client nothing is sent, and the page says the same.
		if (guard.linkRequested(attempt))
			await sendSignInLink(
				event.url.origin,
				form.data.email,
				'sign-in',
				safeReturnTo(event.url.searchParams.get('returnTo'))
			);
		redirect(303, '/signin/check-email');
	}
} satisfies Actions;
