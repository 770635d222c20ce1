import { fail } from '@sveltejs/kit';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import * as wps from '$lib/server/wps';
import * as projects from '$lib/server/projects';
import { DomainError } from '$lib/server/errors';
import { can } from '$lib/permissions';
import { wpsFormSchema } from '$lib/schemas/wps';
import { readWps, WPS_FIELDS, wpsLabel, type WpsField } from '$lib/wps-register';
import type { Actions, PageServerLoad } from './$types';

/** What the save action tells the person who sent the form. */
export type WpsNotice = { tone: 'ok' | 'error'; text: string };

export const load = (async ({ locals }) => ({
	title: 'WPS register',
	items: wps.list(locals.projectId!).map(wps.wpsJson),
	units: projects.unitsOf(locals.projectId!),
	canManage: can(locals.user!, 'wps.manage', locals.projectId!),
	form: await superValidate(zod4(wpsFormSchema), { id: 'wps' })
})) satisfies PageServerLoad;

export const actions = {
	/** Add a WPS (no id) or change one (its id and the version it was read at). */
	save: async ({ request, locals }) => {
		const form = await superValidate(request, zod4(wpsFormSchema), { id: 'wps' });
		if (!form.valid) return fail(400, { form });
		const { id, version, ...typed } = form.data;
		const projectId = locals.projectId!;
		// Every problem on its own field, not only the first.
		const read = readWps(typed, projects.unitsOf(projectId));
		if (!read.ok) {
			for (const problem of read.problems) setError(form, problem.field, problem.message);
			return fail(400, { form });
		}
		try {
			const saved = id
				? wps.update(projectId, id, { ...typed, version }, locals.user!.id)
				: wps.create(projectId, typed, locals.user!.id);
			const text = `WPS ${wpsLabel(saved)} ${id ? 'saved' : 'added to the register'}.`;
			return message(form, { tone: 'ok', text } satisfies WpsNotice);
		} catch (error) {
			if (!(error instanceof DomainError)) throw error;
			if (error.field && (WPS_FIELDS as readonly string[]).includes(error.field)) {
				return setError(form, error.field as WpsField, error.message, { status: error.status });
			}
			return message(form, { tone: 'error', text: error.message } satisfies WpsNotice, {
				status: error.status
			});
		}
	}
} satisfies Actions;
