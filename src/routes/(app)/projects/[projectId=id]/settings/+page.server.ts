import { fail } from '@sveltejs/kit';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import * as criteriaSets from '$lib/server/criteria-sets';
import * as projects from '$lib/server/projects';
import { projectSettingsSchema } from '$lib/schemas/project';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ parent }) => {
	const { project } = await parent();
	const form = await superValidate(
		{
			name: project.name,
			client: project.client,
			contractor: project.contractor,
			site: project.site,
			defaultCriteriaSet: project.defaultCriteriaSet,
			shopPrefix: project.weldNumberRule.shopPrefix,
			fieldPrefix: project.weldNumberRule.fieldPrefix,
			sequence: project.weldNumberRule.sequence
		},
		zod4(projectSettingsSchema)
	);
	return {
		title: `Settings · ${project.code}`,
		form,
		criteriaChoices: criteriaSets.choices(project.id)
	};
}) satisfies PageServerLoad;

export const actions = {
	default: async ({ request, locals }) => {
		const form = await superValidate(request, zod4(projectSettingsSchema));
		if (!form.valid) return fail(400, { form });
		if (!criteriaSets.resolve(locals.projectId!, form.data.defaultCriteriaSet)) {
			const problem = criteriaSets.unknownSet(
				locals.projectId!,
				form.data.defaultCriteriaSet,
				'defaultCriteriaSet'
			);
			return setError(form, 'defaultCriteriaSet', problem.message);
		}
		projects.updateSettings(locals.projectId!, form.data, locals.user!.id);
		return message(
			form,
			'Settings saved. New joints are numbered by the new rule; existing numbers never change.'
		);
	}
} satisfies Actions;
