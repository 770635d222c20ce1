import * as mail from '$lib/server/mail';
import type { PageServerLoad } from './$types';

export const load = (async ({ url }) => {
	const page = Math.max(1, Number(url.searchParams.get('page')) || 1);
	return { title: 'Mail sent', standIn: mail.usingStandIn(), ...mail.listMessages({ page }) };
}) satisfies PageServerLoad;
