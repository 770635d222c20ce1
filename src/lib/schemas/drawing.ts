/** Inputs about drawings and revisions, shared by the upload form, the API and the tests. */
import { z } from 'zod';
import { note, text } from './text';

export const DRAWING_KINDS = ['isometric', 'shop', 'structural'] as const;

const field = (what: string, max: number) => text(what, max).default('');

export const revisionLabel = z
	.string()
	.trim()
	.toUpperCase()
	.regex(/^[A-Z0-9][A-Z0-9.-]{0,7}$/, {
		error: 'A revision label is 1 to 8 letters or digits, such as 0, 1, A or B.'
	});

export const newDrawingSchema = z.object({
	number: text('A drawing number', 80, { min: 1, minError: 'Enter the drawing number.' }),
	title: field('The title', 200),
	kind: z.enum(DRAWING_KINDS, {
		error: 'Choose the drawing type: isometric, fabrication detail or structural.'
	}),
	revision: revisionLabel.default('0'),
	note: note('The note', 500).default(''),
	line: field('The line', 120),
	area: field('The area', 80),
	system: field('The system', 80)
});

/** The register data of a drawing, as the document controller edits it afterwards. */
export const registerFields = z.object({
	number: text('A drawing number', 80, { min: 1, minError: 'Enter the drawing number.' }),
	title: text('The title', 200),
	kind: z.enum(DRAWING_KINDS, { error: 'Choose isometric, shop or structural.' }),
	line: text('The line', 120),
	area: text('The area', 80),
	system: text('The system', 80)
});

const drawingVersion = z
	.number({ error: 'Send the drawing version you last saw.' })
	.int({ error: 'The drawing version is a whole number.' })
	.min(1, { error: 'The drawing version is a whole number from 1.' });

/** An edit of the register data: the fields to change and the version the editor last saw. */
export const updateDrawingSchema = registerFields.partial().extend({ version: drawingVersion });

/** The page form of the register data: every field, and the version it was loaded at. */
export const drawingDetailsForm = registerFields.extend({ version: drawingVersion });
export type UpdateDrawing = z.infer<typeof updateDrawingSchema>;

export const newRevisionSchema = z.object({
	label: revisionLabel,
	note: note('The note', 500).default('')
});

export const DRAWING_STATUSES = ['open', 'complete', 'review', 'empty'] as const;
export const DRAWING_SORTS = ['number', 'title', 'kind', 'area', 'revised'] as const;

export const drawingListQuery = z.object({
	q: z.string().trim().max(80, { error: 'Search for at most 80 characters.' }).default(''),
	kind: z.enum(DRAWING_KINDS).optional().catch(undefined),
	area: z.string().trim().max(80).optional().catch(undefined),
	status: z.enum(DRAWING_STATUSES).optional().catch(undefined),
	sort: z.enum(DRAWING_SORTS).default('number').catch('number'),
	dir: z.enum(['asc', 'desc']).default('asc').catch('asc'),
	page: z.coerce.number().int().min(1).default(1).catch(1),
	pageSize: z.coerce.number().int().min(1).max(200).default(50).catch(50)
});

export type DrawingListQuery = z.infer<typeof drawingListQuery>;
