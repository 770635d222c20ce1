/** Inputs about drawings and revisions, shared by the upload form, the API and the tests. */
import { z } from 'zod';

export const DRAWING_KINDS = ['isometric', 'shop', 'structural'] as const;

const text = (max: number) => z.string().trim().max(max).default('');

export const revisionLabel = z
	.string()
	.trim()
	.toUpperCase()
	.regex(/^[A-Z0-9][A-Z0-9.-]{0,7}$/, {
		error: 'A revision label is 1 to 8 letters or digits, such as 0, 1, A or B.'
	});

export const newDrawingSchema = z.object({
	number: z
		.string()
		.trim()
		.min(1, { error: 'Enter the drawing number.' })
		.max(80, { error: 'A drawing number has at most 80 characters.' }),
	title: text(200),
	kind: z.enum(DRAWING_KINDS, { error: 'Choose isometric, shop or structural.' }),
	revision: revisionLabel.default('0'),
	note: text(500),
	line: text(120),
	area: text(80),
	system: text(80)
});

export const newRevisionSchema = z.object({
	label: revisionLabel,
	note: text(500)
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
