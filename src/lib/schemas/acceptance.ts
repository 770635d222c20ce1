/** The evaluation request: one zod schema shared by the API route, the joint forms and the tests. */
import { z } from 'zod';
import {
	flangeTypes,
	indicationTypes,
	jointKinds,
	loadings,
	members,
	ndeMethodsJudged,
	readingIds,
	seams,
	stages,
	stressDirections
} from '$lib/acceptance';
import type { UnitSystem } from '$lib/units';

export const unitSystems = ['imperial', 'metric'] as const satisfies readonly UnitSystem[];

/** A length as typed (`3/4 in`, `19 mm`), or a number of millimetres. */
const jointLength = z.union([z.string().max(40), z.number()], {
	error: 'Give a length as typed, such as "3/4 in" or "19 mm", or a number of millimetres.'
});

const choice = <T extends readonly [string, ...string[]]>(values: T, what: string) =>
	z.enum(values, { error: `${what} must be one of ${values.join(', ')}.` });

export const jointSchema = z.object(
	{
		kind: choice(jointKinds, 'The joint kind'),
		thickness: jointLength.optional(),
		requiredSize: jointLength.optional(),
		weldLength: jointLength.optional(),
		loading: choice(loadings, 'The loading').optional(),
		member: choice(members, 'The member').optional(),
		stress: choice(stressDirections, 'The stress direction').optional(),
		/** a butt weld along a plate or seam, or round a pipe */
		seam: choice(seams, 'The seam').optional(),
		/** outside diameter of pipe: a butt joint with one is a girth weld of that circumference */
		diameter: jointLength.optional(),
		/** socket wall, or the hub of a flange, beside a socket or flange fillet */
		socketWall: jointLength.optional(),
		flange: choice(flangeTypes, 'The flange').optional()
	},
	{ error: 'Describe the joint, at least its kind: { "kind": "butt" }.' }
);

/**
 * Readings by id: a length or angle as typed, a number in mm or degrees, or yes/no for flags.
 * An id the engine does not know is refused rather than ignored, so a misspelt reading cannot
 * quietly drop out of a verdict.
 */
const readingValue = z.union([z.string().max(40), z.number(), z.boolean(), z.null()], {
	error:
		'Give a reading as typed ("3/32", "2.5 mm", "37.5°"), a number in mm or degrees, or true/false.'
});

export const readingsSchema = z.record(z.string(), readingValue).superRefine((readings, ctx) => {
	for (const id of Object.keys(readings)) {
		if ((readingIds as readonly string[]).includes(id)) continue;
		ctx.addIssue({
			code: 'custom',
			path: [id],
			message: `Unknown reading "${id}"; use one of: ${readingIds.join(', ')}.`
		});
	}
});

export const evaluateRequestSchema = z.object({
	criteria: z
		.string({ error: 'Name the criteria set, such as "aws-d1.1-static".' })
		.trim()
		.min(1, { error: 'Name the criteria set, such as "aws-d1.1-static".' }),
	/** judge by a set of this project (its own or built-in); the caller must be a member */
	projectId: z
		.number({ error: 'projectId is the number of a project you are a member of.' })
		.int({ error: 'projectId is the number of a project you are a member of.' })
		.positive({ error: 'projectId is the number of a project you are a member of.' })
		.optional(),
	stage: z.enum(stages, {
		error: `The stage must be one of ${stages.join(', ')}, or nde with the indications of an RT or UT report.`
	}),
	units: choice(unitSystems, 'The units').default('imperial'),
	joint: jointSchema,
	readings: readingsSchema.default({}),
	/** a fit-up also judged against this WPS of the project's register (its number) */
	wps: z
		.string({
			error: 'wps is the number of a WPS in the project\'s register, such as "WPS-CS-01".'
		})
		.trim()
		.min(1, {
			error: 'wps is the number of a WPS in the project\'s register, such as "WPS-CS-01".'
		})
		.max(40, { error: 'A WPS number has at most 40 characters.' })
		.optional(),
	/** its revision; by default the approved one */
	wpsRevision: z
		.string({ error: 'wpsRevision is the WPS revision as text, such as "1".' })
		.trim()
		.min(1, { error: 'wpsRevision is the WPS revision as text, such as "1".' })
		.max(20, { error: 'A WPS revision has at most 20 characters.' })
		.optional()
});

export type EvaluateRequest = z.infer<typeof evaluateRequestSchema>;

/** One indication of an RT or UT report; lengths as typed, or numbers of millimetres. */
export const indicationSchema = z.object(
	{
		type: choice(indicationTypes, 'The indication type'),
		length: jointLength.optional(),
		width: jointLength.optional(),
		depth: jointLength.optional(),
		position: jointLength.optional(),
		darker: z.boolean({ error: 'darker is true or false.' }).optional()
	},
	{ error: 'Describe each indication, at least its type: { "type": "incompletePenetration" }.' }
);

/** A report rarely lists more; more is a slip or an import gone wrong. */
export const MAX_INDICATIONS = 200;

export const indicationsSchema = z
	.array(indicationSchema, { error: 'Give the indications as a list.' })
	.max(MAX_INDICATIONS, { error: `At most ${MAX_INDICATIONS} indications in one result.` });

/** The NDE evaluation request: the indications of an RT or UT report, judged by the set. */
export const evaluateIndicationsSchema = z.object({
	criteria: evaluateRequestSchema.shape.criteria,
	projectId: evaluateRequestSchema.shape.projectId,
	stage: z.literal('nde'),
	method: z.enum(ndeMethodsJudged, {
		error: `Indications are judged for ${ndeMethodsJudged.join(' and ')}; an MT or PT result is the report's.`
	}),
	units: choice(unitSystems, 'The units').default('imperial'),
	joint: jointSchema,
	indications: indicationsSchema.default([])
});

export type EvaluateIndicationsRequest = z.infer<typeof evaluateIndicationsSchema>;
