/**
 * NDE lots and sampling: every input, one zod schema each, shared by the API routes, the
 * pages and the tests.
 */
import { z } from 'zod';
import { MAX_SEED } from '$lib/random';
import { LOT_GROUPINGS, WELD_KINDS } from '$lib/nde/extent';
import { NDE_METHODS, REASON_MIN_LENGTH } from '$lib/domain';
import { note, text } from './text';
import { indicationsSchema } from './acceptance';

export const seedSchema = z
	.number({ error: 'A seed is a whole number from 0 to 4294967295.' })
	.int({ error: 'A seed is a whole number from 0 to 4294967295.' })
	.min(0, { error: 'A seed is a whole number from 0 to 4294967295.' })
	.max(MAX_SEED, { error: 'A seed is a whole number from 0 to 4294967295.' });

const jointId = z
	.number({ error: 'A joint is given by its id.' })
	.int({ error: 'A joint is given by its id.' })
	.positive({ error: 'A joint is given by its id.' });

const reason = note('The reason', 500, {
	min: REASON_MIN_LENGTH,
	minError: 'Say why (at least 3 characters); the reason stays in the record.'
});

export const swapSchema = z.object({ out: jointId, in: jointId, reason });
export type SwapInput = z.infer<typeof swapSchema>;

export const commitSelectionSchema = z.object({
	seed: seedSchema.optional(),
	/** Swaps made to the proposal before it is committed. */
	swaps: z.array(swapSchema).max(200).default([])
});

export const closeLotSchema = z.object({
	note: note('The note', 500).default('')
});

export const sendRequestSchema = z.object({
	/** Lots whose selected welds go on the request; every lot of the project when left out. */
	lotIds: z
		.array(z.number().int().positive(), { error: 'lotIds is a list of lot ids.' })
		.max(1000)
		.optional(),
	note: note('The note', 1000).default('')
});

export const LOT_STAGES = ['open', 'sampled', 'progressive', 'full', 'closed'] as const;

export const lotsQuerySchema = z.object({
	status: z.enum(['open', 'closed'], { error: 'status is open or closed.' }).optional(),
	stage: z.enum(LOT_STAGES, { error: `stage is one of: ${LOT_STAGES.join(', ')}.` }).optional(),
	q: text('The search', 80).default(''),
	page: z.coerce
		.number({ error: 'The page is a whole number from 1.' })
		.int({ error: 'The page is a whole number from 1.' })
		.min(1, { error: 'The page is a whole number from 1.' })
		.default(1),
	pageSize: z.coerce
		.number({ error: 'The page size is a whole number from 1 to 200.' })
		.int({ error: 'The page size is a whole number from 1 to 200.' })
		.min(1, { error: 'The page size is a whole number from 1 to 200.' })
		.max(200, { error: 'The page size is a whole number from 1 to 200.' })
		.default(25)
});
export type LotsQuery = z.infer<typeof lotsQuerySchema>;

/** What an NDE result adds to an inspection record, beside the report number and technician. */
export const ndeResultExtras = {
	/** RT and UT only: the indications the report names, as the acceptance engine reads them. */
	indications: indicationsSchema.optional(),
	/** On a reject: whose work the defect is in, by stamp; every welder of the weld when left out. */
	welders: z
		.array(text('A welder stamp', 24, { min: 1, minError: 'Give each welder stamp.' }))
		.max(6)
		.optional()
};

const extent = z.object({
	method: z.enum(NDE_METHODS, { error: 'The NDE method must be RT, UT, MT or PT.' }),
	percent: z.coerce
		.number({ error: 'The extent is a percent from 0 to 100.' })
		.min(0, { error: 'The extent is a percent from 0 to 100.' })
		.max(100, { error: 'The extent is a percent from 0 to 100.' }),
	kinds: z
		.array(z.enum(WELD_KINDS, { error: 'Kinds are butt, fillet, socket or branch.' }))
		.min(1, { error: 'Choose the kinds of weld the extent covers.' })
});

export const ndeSettingsSchema = z.object({
	groupBy: z.enum(LOT_GROUPINGS, { error: 'Choose how lots form.' }),
	everyWelder: z.boolean().default(true),
	contractorEmail: z
		.union([z.literal(''), z.email({ error: 'Give the NDE contractor an e-mail address.' })])
		.default(''),
	/** By criteria set id: the extent that replaces the code's; a set left out keeps the code's. */
	extents: z.record(z.string().min(1).max(120), z.array(extent).max(4)).default({})
});
export type NdeSettings = z.infer<typeof ndeSettingsSchema>;
