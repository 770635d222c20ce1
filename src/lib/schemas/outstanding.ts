/**
 * Inputs of the outstanding board, the welder register and inspection requests: one zod
 * schema each, shared by the API routes, the page actions and the tests.
 */
import { z } from 'zod';
import type { JointState } from '$lib/joint-state';
import { OWED_STATES, type RequestStage } from '$lib/outstanding';

const OWED_LIST_STATES = [...OWED_STATES.foreman, ...OWED_STATES.inspector] as [
	JointState,
	...JointState[]
];

const id = z.coerce.number().int().min(1);
const isoDate = (what: string) =>
	z
		.string({ error: `${what} must be a date.` })
		.regex(/^\d{4}-\d{2}-\d{2}$/, { error: `${what} is a date written YYYY-MM-DD.` });
const text = (max: number, what: string) =>
	z
		.string({ error: `${what} must be text.` })
		.trim()
		.max(max, { error: `${what} has at most ${max} characters.` });

export const outstandingQuerySchema = z.object({
	area: text(80, 'The area').optional(),
	drawing: id.optional(),
	welder: id.optional(),
	/** Rows per owed list; a big job has thousands outstanding. */
	limit: z.coerce
		.number({ error: 'The limit is a whole number from 1 to 200.' })
		.int({ error: 'The limit is a whole number from 1 to 200.' })
		.min(1, { error: 'The limit is a whole number from 1 to 200.' })
		.max(200, { error: 'The limit is a whole number from 1 to 200.' })
		.default(50),
	/** One owed list only (a state some role owes), for "show more" on the board. */
	list: z
		.enum(OWED_LIST_STATES, {
			error: `The list is one of the owed states: ${OWED_LIST_STATES.join(', ')}.`
		})
		.optional(),
	/** Joints of that list to skip, oldest first; only with `list`. */
	offset: z.coerce
		.number({ error: 'The offset is a whole number from 0.' })
		.int({ error: 'The offset is a whole number from 0.' })
		.min(0, { error: 'The offset is a whole number from 0.' })
		.default(0)
});
export type OutstandingQuery = z.infer<typeof outstandingQuerySchema>;

export const REQUEST_STAGES = ['fitup', 'visual'] as const satisfies readonly RequestStage[];

export const inspectionRequestSchema = z.object({
	stage: z.enum(REQUEST_STAGES, { error: 'The stage must be fitup or visual.' }),
	jointIds: z
		.array(z.number().int().min(1), { error: 'jointIds is a list of joint ids.' })
		.min(1, { error: 'Choose at least one joint.' })
		.max(200, { error: 'Request at most 200 joints at once.' }),
	note: text(500, 'The note').optional()
});
export type InspectionRequestInput = z.infer<typeof inspectionRequestSchema>;

export const qualificationSchema = z.object({
	process: text(20, 'The process')
		.min(2, { error: 'Give the process, such as GTAW or SMAW.' })
		.transform((p) => p.toUpperCase()),
	qualifiedOn: isoDate('The qualification date'),
	reference: text(60, 'The qualification record').optional().default(''),
	expiresOn: isoDate('The expiry date').optional()
});
export type QualificationInput = z.infer<typeof qualificationSchema>;

export const welderSchema = z.object({
	stamp: text(20, 'The stamp').min(1, { error: 'Give the welder stamp.' }),
	name: text(120, 'The name').min(1, { error: 'Give the welder name.' }),
	employer: text(120, 'The employer').optional().default(''),
	processes: z.array(qualificationSchema).max(12).optional().default([])
});
export type WelderInput = z.infer<typeof welderSchema>;

export const welderStatusSchema = z.object({
	welderId: id,
	status: z.enum(['active', 'inactive'], { error: 'The status is active or inactive.' })
});

/**
 * The add-welder form: the welder with, optionally, their first process on the same line, in
 * the same field rules as the API's welder; more processes come through the qualify form.
 */
export const welderFormSchema = welderSchema
	.omit({ processes: true })
	.extend({
		process: qualificationSchema.shape.process.optional(),
		qualifiedOn: qualificationSchema.shape.qualifiedOn.optional(),
		reference: qualificationSchema.shape.reference
	})
	.refine((v) => !v.process || v.qualifiedOn, {
		error: 'Give the date the process was qualified.',
		path: ['qualifiedOn']
	});

/** The welder of the add-welder form, as the API would receive it. */
export function welderFromForm(form: z.infer<typeof welderFormSchema>): WelderInput {
	const { process, qualifiedOn, reference, ...welder } = form;
	return {
		...welder,
		processes: process && qualifiedOn ? [{ process, qualifiedOn, reference }] : []
	};
}

/** A process qualification added to or renewed for one welder of the register. */
export const welderQualificationSchema = qualificationSchema.extend({ welderId: id });
