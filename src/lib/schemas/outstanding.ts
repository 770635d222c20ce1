/**
 * Inputs of the outstanding board, the welder register and inspection requests: one zod
 * schema each, shared by the API routes, the page actions and the tests.
 */
import { z } from 'zod';
import type { JointState } from '$lib/joint-state';
import { OWED_STATES, type RequestStage } from '$lib/outstanding';
import { calendarDate, note, text } from './text';

const OWED_LIST_STATES = [...OWED_STATES.foreman, ...OWED_STATES.inspector] as [
	JointState,
	...JointState[]
];

const id = z.coerce.number().int().min(1);

export const outstandingQuerySchema = z.object({
	area: text('The area', 80).optional(),
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
	note: note('The note', 500).optional()
});
export type InspectionRequestInput = z.infer<typeof inspectionRequestSchema>;

export const qualificationSchema = z.object({
	process: text('The process', 20)
		.min(2, { error: 'Give the process, such as GTAW or SMAW.' })
		.transform((p) => p.toUpperCase()),
	qualifiedOn: calendarDate('The qualification date'),
	reference: text('The qualification record', 60).optional().default(''),
	expiresOn: calendarDate('The expiry date').optional()
});
export type QualificationInput = z.infer<typeof qualificationSchema>;

export const welderSchema = z.object({
	stamp: text('The stamp', 20, { min: 1, minError: 'Give the welder stamp.' }),
	name: text('The name', 120, { min: 1, minError: 'Give the welder name.' }),
	employer: text('The employer', 120).optional().default(''),
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
