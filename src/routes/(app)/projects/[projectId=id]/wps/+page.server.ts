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

const EMPTY = { ok: false, rows: [], problems: [] };

/** What the save action tells the person who sent the form. */
export type WpsNotice = { tone: 'ok' | 'error'; text: string };

export const load = (async ({ locals }) => ({
	title: 'WPS register',
	items: wps.list(locals.projectId!).map(wps.wpsJson),
	units: projects.unitsOf(locals.projectId!),
	canManage: can(locals.user!, 'wps.manage', locals.projectId!),
	form: await superValidate(zod4(wpsFormSchema), { id: 'wps' })
})) satisfies PageServerLoad;

/** The CSV a form posted: an uploaded file, or the text carried over from the preview. */
async function postedCsv(request: Request): Promise<string | null> {
	const data = await request.formData();
	const file = data.get('file');
	if (file instanceof File && file.size > 0) return await file.text();
	const text = data.get('csv');
	return typeof text === 'string' && text.trim() ? text : null;
}

const NO_FILE = 'Choose a CSV file made from the template.';

export const actions = {
	/** Read a CSV and show what it would add, or every problem by line and column. */
	preview: async ({ request, locals }) => {
		const csv = await postedCsv(request);
		if (csv === null)
			return fail(400, { csvImport: { applied: false, csv: '', message: NO_FILE, ...EMPTY } });
		const preview = wps.importCsv(locals.projectId!, csv, {
			apply: false,
			userId: locals.user!.id
		});
		return { csvImport: { applied: false, csv, message: null, ...preview } };
	},
	/** Add every WPS of the CSV, or none when any line has a problem. */
	import: async ({ request, locals }) => {
		const csv = await postedCsv(request);
		if (csv === null)
			return fail(400, { csvImport: { applied: false, csv: '', message: NO_FILE, ...EMPTY } });
		const result = wps.importCsv(locals.projectId!, csv, { apply: true, userId: locals.user!.id });
		if (!result.ok)
			return fail(400, { csvImport: { applied: false, csv, message: null, ...result } });
		return {
			csvImport: {
				applied: true,
				csv: '',
				message: `${result.rows.length} WPS${result.rows.length === 1 ? '' : 's'} added to the register.`,
				...result
			}
		};
	},
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
