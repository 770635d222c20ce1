import { redirect } from '@sveltejs/kit';
import { signOut } from '../../../auth';
import type { Actions, PageServerLoad } from './$types';

export const load = (() => {
	redirect(303, '/signin');
}) satisfies PageServerLoad;

export const actions = { default: signOut } satisfies Actions;
