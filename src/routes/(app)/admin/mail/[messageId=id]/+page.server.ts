import { error } from '@sveltejs/kit';
import * as mail from '$lib/server/mail';
import type { PageServerLoad } from './$types';

export const load = (async ({ params }) => {
	const message = mail.getMessage(Number(params.messageId));
	if (!message) error(404, 'There is no such message.');
	return { title: message.subject, message };
}) satisfies PageServerLoad;
