import { error, fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import * as drawings from '$lib/server/drawings';
import { formFailure } from '$lib/server/errors';
import { drawingDetailsForm } from '$lib/schemas/drawing';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ locals, params }) => {
	const drawing = drawings.get(locals.projectId!, Number(params.drawingId));
	if (!drawing) error(404, 'There is no such drawing in this project.');
	const form = await superValidate(
		{
			number: drawing.number,
			title: drawing.title,
			kind: drawing.kind,
			line: drawing.line,
			area: drawing.area,
			system: drawing.system,
			version: drawing.version
		},
		zod4(drawingDetailsForm)
	);
	return { title: `Details · ${drawing.number}`, drawing, form };
}) satisfies PageServerLoad;

export const actions = {
	default: async ({ request, locals, params }) => {
		const form = await superValidate(request, zod4(drawingDetailsForm));
		if (!form.valid) return fail(400, { form });
		try {
			const saved = drawings.update(
				locals.projectId!,
				Number(params.drawingId),
				form.data,
				locals.user!.id
			);
			form.data.version = saved.version;
			return message(form, 'Saved. The register, the board and the log filters use it now.');
		} catch (failure) {
			return formFailure(failure, form);
		}
	}
} satisfies Actions;
