/**
 * Recording results on a joint: an inspection (fit-up, visual, NDE) signed by the inspector,
 * and a weld with its welder stamps. One zod schema each, shared by the API routes, the forms
 * and the tests. The server judges the readings itself; nothing here carries a verdict.
 */
import { z } from 'zod';
import { DECISIONS, INSPECTION_STAGES, NDE_METHODS, REASON_MIN_LENGTH } from '$lib/domain';
import { readingsSchema } from './acceptance';
import { ndeResultExtras } from './nde';
import { jointVersion } from './joint';
import { calendarDate, note, text } from './text';

const version = jointVersion;

export const recordInspectionSchema = z
	.object({
		stage: z.enum(INSPECTION_STAGES, { error: 'The stage must be fitup, visual or nde.' }),
		method: z.enum(NDE_METHODS, { error: 'The NDE method must be RT, UT, MT or PT.' }).optional(),
		readings: readingsSchema.default({}),
		decision: z.enum(DECISIONS, { error: 'The decision must be accept or reject.' }),
		/** Required when the decision goes against the verdict; kept with the record. */
		reason: note('The reason', 1000).optional(),
		reportNo: text('The report number', 60).optional(),
		/** The NDE technician and level, as the report names them. */
		technician: text('The technician', 120).optional(),
		/** A correction names the record it replaces; the old one stays in the history. */
		supersedes: z
			.number({ error: 'supersedes is the id of the inspection being corrected.' })
			.int()
			.min(1)
			.optional(),
		version,
		...ndeResultExtras
	})
	.superRefine((input, ctx) => {
		if (input.stage === 'nde' && !input.method) {
			ctx.addIssue({
				code: 'custom',
				path: ['method'],
				message: 'Name the NDE method: RT, UT, MT or PT.'
			});
		}
		if (input.stage !== 'nde' && input.method) {
			ctx.addIssue({
				code: 'custom',
				path: ['method'],
				message: 'A method belongs to an NDE result only; leave it out for fit-up and visual.'
			});
		}
		if (input.stage === 'nde' && Object.keys(input.readings).length > 0) {
			// The NDE report carries its own indications; the gauge readings belong to fit-up and visual.
			ctx.addIssue({
				code: 'custom',
				path: ['readings'],
				message: 'An NDE result carries no gauge readings; give the report number and the decision.'
			});
		}
		if (
			input.indications?.length &&
			!(input.stage === 'nde' && ['RT', 'UT'].includes(input.method!))
		)
			ctx.addIssue({
				code: 'custom',
				path: ['indications'],
				message: 'Indications belong to an RT or UT result.'
			});
		if (input.welders?.length && !(input.stage === 'nde' && input.decision === 'reject'))
			ctx.addIssue({
				code: 'custom',
				path: ['welders'],
				message: 'The welders whose work the defect is in are named on an NDE reject only.'
			});
	});

export type RecordInspection = z.infer<typeof recordInspectionSchema>;

/** A welder stamp as it is marked beside the weld, e.g. `B14`. */
const stamp = text('A welder stamp', 24, { min: 1, minError: 'Enter the welder stamp.' });

export const recordWeldSchema = z.object({
	weldedOn: calendarDate('The weld date'),
	welders: z.object(
		{
			root: stamp,
			fill: stamp.optional(),
			cap: stamp.optional()
		},
		{ error: 'Give the welder stamps by pass: { "root": "B14", "fill": "B22", "cap": "B22" }.' }
	),
	/** The WPS used; the joint's WPS when left out. */
	wps: text('The WPS', 60).optional(),
	/** One process for every pass (`GTAW`), or by pass (`GTAW/SMAW`: root, then fill and cap). */
	process: text('The process', 40).optional(),
	/** An administrator letting a lapsed or expired qualification through, with the reason. */
	override: z
		.object({
			reason: note('The override reason', 500, {
				min: REASON_MIN_LENGTH,
				minError: 'Say why the qualification check is overridden.'
			})
		})
		.optional(),
	version
});

export type RecordWeld = z.infer<typeof recordWeldSchema>;
