import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import * as welders from '$lib/server/welders';
import * as nde from '$lib/server/nde';
import { formFailure } from '$lib/server/errors';
import { can } from '$lib/permissions';
import {
	welderFormSchema,
	welderFromForm,
	welderQualificationSchema,
	welderStatusSchema
} from '$lib/schemas/outstanding';
import type { Actions, PageServerLoad } from './$types';

/** What an action tells the person who sent the form. */
export type WelderNotice = { tone: 'ok' | 'error'; text: string };

export const load = (async ({ locals }) => ({
	title: 'Welders',
	...welders.register(locals.projectId!),
	canManage: can(locals.user!, 'welder.manage', locals.projectId!),
	form: await superValidate(zod4(welderFormSchema), { id: 'create' }),
	repairRates: nde.repairRates(locals.projectId!)
})) satisfies PageServerLoad;

/** A refusal of the register (a stamp taken, a welder gone) shown on the form that asked. */
const notice = (text: string): WelderNotice => ({ tone: 'error', text });

export const actions = {
	create: async ({ request, locals }) => {
		const form = await superValidate(request, zod4(welderFormSchema), { id: 'create' });
		if (!form.valid) return fail(400, { form });
		try {
			const welder = welders.create(locals.projectId!, welderFromForm(form.data), locals.user!.id);
			const text = `Welder ${welder.stamp} (${welder.name}) added.`;
			return message(form, { tone: 'ok', text } satisfies WelderNotice);
		} catch (error) {
			return formFailure(error, form, notice);
		}
	},
	qualify: async ({ request, locals }) => {
		const form = await superValidate(request, zod4(welderQualificationSchema), { id: 'qualify' });
		if (!form.valid) return fail(400, { form });
		const { welderId, ...qualification } = form.data;
		try {
			welders.qualify(locals.projectId!, welderId, qualification, locals.user!.id);
			const text = `${qualification.process} qualification recorded.`;
			return message(form, { tone: 'ok', text } satisfies WelderNotice);
		} catch (error) {
			return formFailure(error, form, notice);
		}
	},
	status: async ({ request, locals }) => {
		const form = await superValidate(request, zod4(welderStatusSchema), { id: 'status' });
		if (!form.valid) return fail(400, { form });
		try {
			welders.setStatus(locals.projectId!, form.data.welderId, form.data.status, locals.user!.id);
			const text = `Welder marked ${form.data.status}.`;
			return message(form, { tone: 'ok', text } satisfies WelderNotice);
		} catch (error) {
			return formFailure(error, form, notice);
		}
	}
} satisfies Actions;
