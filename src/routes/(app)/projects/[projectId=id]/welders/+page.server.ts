import { fail } from '@sveltejs/kit';
import type { z } from 'zod';
import * as welders from '$lib/server/welders';
import * as nde from '$lib/server/nde';
import { can } from '$lib/permissions';
import { qualificationSchema, welderSchema, welderStatusSchema } from '$lib/schemas/outstanding';
import type { Actions, PageServerLoad } from './$types';

export const load = (({ locals }) => ({
	title: 'Welders',
	...welders.register(locals.projectId!),
	canManage: can(locals.user!, 'welder.manage', locals.projectId!),
	repairRates: nde.repairRates(locals.projectId!)
})) satisfies PageServerLoad;

type Failure = { action: string; message: string; field?: string; error: true };

/** The filled-in fields of a form; a blank optional field is left out, not sent as ''. */
function fieldsOf(form: FormData): Record<string, string> {
	return Object.fromEntries(
		[...form.entries()].filter(
			(entry): entry is [string, string] => typeof entry[1] === 'string' && entry[1].trim() !== ''
		)
	);
}

function parsed<T extends z.ZodType>(schema: T, input: unknown, action: string) {
	const result = schema.safeParse(input);
	if (result.success) return { data: result.data as z.infer<T> };
	const issue = result.error.issues[0];
	return {
		failure: fail(400, {
			action,
			message: issue?.message ?? 'The form is not valid.',
			field: issue?.path.join('.'),
			error: true
		} satisfies Failure)
	};
}

function refused(action: string, error: unknown) {
	if (error instanceof welders.WelderError)
		return fail(error.status, {
			action,
			message: error.message,
			field: error.field,
			error: true
		} satisfies Failure);
	throw error;
}

export const actions = {
	create: async ({ request, locals }) => {
		const { process, qualifiedOn, reference, ...welder } = fieldsOf(await request.formData());
		// The form adds the welder with their first process; more come through "Add a process".
		const processes = process ? [{ process, qualifiedOn, reference }] : [];
		const input = parsed(welderSchema, { ...welder, processes }, 'create');
		if ('failure' in input) return input.failure;
		try {
			const welder = welders.create(locals.projectId!, input.data, locals.user!.id);
			return { action: 'create', message: `Welder ${welder.stamp} (${welder.name}) added.` };
		} catch (error) {
			return refused('create', error);
		}
	},
	qualify: async ({ request, locals }) => {
		const form = await request.formData();
		const input = parsed(qualificationSchema, fieldsOf(form), 'qualify');
		if ('failure' in input) return input.failure;
		const welderId = Number(form.get('welderId'));
		try {
			welders.qualify(locals.projectId!, welderId, input.data, locals.user!.id);
			return { action: 'qualify', message: `${input.data.process} qualification recorded.` };
		} catch (error) {
			return refused('qualify', error);
		}
	},
	status: async ({ request, locals }) => {
		const input = parsed(welderStatusSchema, fieldsOf(await request.formData()), 'status');
		if ('failure' in input) return input.failure;
		try {
			welders.setStatus(locals.projectId!, input.data.welderId, input.data.status, locals.user!.id);
			return { action: 'status', message: `Welder marked ${input.data.status}.` };
		} catch (error) {
			return refused('status', error);
		}
	}
} satisfies Actions;
