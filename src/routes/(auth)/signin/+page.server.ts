import { redirect } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { signInWithPassword } from '../../../auth';
import * as guard from '$lib/server/sign-in-guard';
import { credentialsSchema } from '$lib/schemas/account';
import { safeReturnTo } from '$lib/return-to';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ locals, url }) => {
	const returnTo = safeReturnTo(url.searchParams.get('returnTo'));
	if (locals.user) redirect(303, returnTo);
	return {
		title: 'Sign in',
		form: await superValidate(zod4(credentialsSchema)),
		returnTo
	};
}) satisfies PageServerLoad;

export const actions = {
	default: async (event) => {
		const form = await superValidate(event.request, zod4(credentialsSchema));
		if (!form.valid) {
			form.data.password = '';
			return message(form, 'Enter your e-mail address and password.', { status: 400 });
		}
		const attempt = { email: form.data.email, client: event.getClientAddress() };
		const verdict = guard.check(attempt);
		if (!verdict.allowed) {
			guard.refused(attempt);
			form.data.password = '';
			return message(
				form,
				`Too many failed sign-ins. Wait ${Math.ceil(verdict.retryAfterS / 60)} minutes, or ask for a sign-in link by e-mail.`,
				{ status: 429 }
			);
		}
		await guard.pause(verdict.delayMs);
		if (!(await signInWithPassword(event, form.data.email, form.data.password))) {
			guard.failed(attempt);
			form.data.password = '';
			// Never says whether the address has an account.
			return message(
				form,
				'That e-mail address and password do not match. Check both and try again.',
				{
					status: 400
				}
			);
		}
		guard.succeeded(attempt);
		redirect(303, safeReturnTo(event.url.searchParams.get('returnTo')));
	}
} satisfies Actions;
