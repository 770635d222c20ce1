import { error, fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import * as users from '$lib/server/users';
import * as projects from '$lib/server/projects';
import { membershipSchema } from '$lib/schemas/account';
import { PROJECT_ROLES, ROLE_LABELS, type ProjectRole } from '$lib/permissions';
import type { Actions, PageServerLoad } from './$types';

function projectOrThrow(id: string) {
	const project = projects.get(Number(id));
	if (!project) error(404, 'There is no such project.');
	return project;
}

export const load = (async ({ params }) => {
	const project = projectOrThrow(params.projectId);
	return {
		title: `Members · ${project.code}`,
		project: { id: project.id, code: project.code, name: project.name },
		members: users.members(project.id),
		form: await superValidate(zod4(membershipSchema))
	};
}) satisfies PageServerLoad;

export const actions = {
	add: async ({ request, params, locals }) => {
		const project = projectOrThrow(params.projectId);
		const form = await superValidate(request, zod4(membershipSchema));
		if (!form.valid) return fail(400, { form });
		const user = users.byEmail(form.data.email);
		if (!user) {
			return message(
				form,
				`${form.data.email} has no account yet: invite them under Users and roles.`,
				{ status: 404 }
			);
		}
		users.setRole(project.id, user.id, form.data.role, locals.user!.id);
		return message(
			form,
			`${user.email} is now ${ROLE_LABELS[form.data.role].toLowerCase()} on ${project.code}.`
		);
	},
	role: async ({ request, params, locals }) => {
		const project = projectOrThrow(params.projectId);
		const data = await request.formData();
		const role = String(data.get('role')) as ProjectRole;
		if (!PROJECT_ROLES.includes(role))
			return fail(400, { memberError: 'Choose one of the roles.' });
		users.setRole(project.id, String(data.get('userId')), role, locals.user!.id);
		return null;
	},
	remove: async ({ request, params, locals }) => {
		const project = projectOrThrow(params.projectId);
		users.setRole(
			project.id,
			String((await request.formData()).get('userId')),
			null,
			locals.user!.id
		);
		return null;
	}
} satisfies Actions;
