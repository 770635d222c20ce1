import { error, fail } from '@sveltejs/kit';
import { message, superValidate, type SuperValidated } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import * as users from '$lib/server/users';
import * as projects from '$lib/server/projects';
import { memberRemoveSchema, memberRoleSchema, membershipSchema } from '$lib/schemas/account';
import { ROLE_LABELS } from '$lib/permissions';
import type { Actions, PageServerLoad } from './$types';

/** What an action tells the administrator who sent the form. */
export type MemberNotice = { tone: 'ok' | 'error'; text: string };

function projectOrThrow(id: string) {
	const project = projects.get(Number(id));
	if (!project) error(404, 'There is no such project.');
	return project;
}

function say<T extends Record<string, unknown>>(
	form: SuperValidated<T>,
	notice: MemberNotice,
	status?: 400 | 404
) {
	return message(form, notice, status ? { status } : undefined);
}

/** The member a row form names: 404 when the account is gone or no longer on the project. */
function memberOf(
	projectId: number,
	userId: string
): { problem: string } | { member: ReturnType<typeof users.members>[number] } {
	const user = users.byId(userId);
	if (!user) return { problem: 'There is no such account: reload the page to see the members.' };
	const member = users.members(projectId).find((m) => m.userId === userId);
	if (!member) {
		return {
			problem: `${user.email} is not a member of this project: reload the page, or add them above.`
		};
	}
	return { member };
}

export const load = (async ({ params }) => {
	const project = projectOrThrow(params.projectId);
	return {
		title: `Members · ${project.code}`,
		project: { id: project.id, code: project.code, name: project.name },
		members: users.members(project.id),
		form: await superValidate(zod4(membershipSchema), { id: 'add' })
	};
}) satisfies PageServerLoad;

export const actions = {
	add: async ({ request, params, locals }) => {
		const project = projectOrThrow(params.projectId);
		const form = await superValidate(request, zod4(membershipSchema), { id: 'add' });
		if (!form.valid) return fail(400, { form });
		const user = users.byEmail(form.data.email);
		if (!user) {
			const text = `${form.data.email} has no account yet: invite them under Users and roles.`;
			return say(form, { tone: 'error', text }, 404);
		}
		users.setRole(project.id, user.id, form.data.role, locals.user!.id);
		const text = `${user.email} is now ${ROLE_LABELS[form.data.role]} on ${project.code}.`;
		return say(form, { tone: 'ok', text });
	},
	role: async ({ request, params, locals }) => {
		const project = projectOrThrow(params.projectId);
		const form = await superValidate(request, zod4(memberRoleSchema), { id: 'role' });
		if (!form.valid) return fail(400, { form });
		const found = memberOf(project.id, form.data.userId);
		if ('problem' in found) return say(form, { tone: 'error', text: found.problem }, 404);
		users.setRole(project.id, form.data.userId, form.data.role, locals.user!.id);
		const text = `${found.member.email} is now ${ROLE_LABELS[form.data.role]} on ${project.code}.`;
		return say(form, { tone: 'ok', text });
	},
	remove: async ({ request, params, locals }) => {
		const project = projectOrThrow(params.projectId);
		const form = await superValidate(request, zod4(memberRemoveSchema), { id: 'remove' });
		if (!form.valid) return fail(400, { form });
		const found = memberOf(project.id, form.data.userId);
		if ('problem' in found) return say(form, { tone: 'error', text: found.problem }, 404);
		users.setRole(project.id, form.data.userId, null, locals.user!.id);
		const text = `${found.member.email} is no longer a member of ${project.code}.`;
		return say(form, { tone: 'ok', text });
	}
} satisfies Actions;
