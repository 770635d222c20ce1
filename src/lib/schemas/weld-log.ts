/** The weld log's query string, shared by the JSON API, the downloads, the page and the tests. */
import { z } from 'zod';
import { JOINT_STATES } from '$lib/joint-state';
import { WELD_LOG_SORTS } from '$lib/weld-log';
import { SELECTION_FILTERS } from '$lib/nde/log';

export const WELD_LOG_MAX_PAGE_SIZE = 500;

export const weldLogFilter = z.object({
	state: z.enum(JOINT_STATES, { error: 'Choose one of the joint states.' }).optional(),
	drawing: z.coerce
		.number({ error: 'A drawing is given by its id.' })
		.int({ error: 'A drawing is given by its id.' })
		.positive({ error: 'A drawing is given by its id.' })
		.optional(),
	area: z.string().trim().max(80, { error: 'An area has at most 80 characters.' }).optional(),
	welder: z
		.string()
		.trim()
		.max(24, { error: 'A welder stamp has at most 24 characters.' })
		.optional(),
	/** Only joints with a standing decision against the verdict (`1`), or any joint. */
	againstVerdict: z
		.stringbool({
			truthy: ['1', 'true', 'yes'],
			falsy: ['0', 'false', 'no'],
			error: 'againstVerdict is 1 (only those) or left out.'
		})
		.optional(),
	q: z.string().trim().max(80, { error: 'Search for at most 80 characters.' }).default(''),
	/** NDE lots: how the weld was selected, its lot, a report number it appears on. */
	selection: z
		.enum(SELECTION_FILTERS, { error: `selection is one of: ${SELECTION_FILTERS.join(', ')}.` })
		.optional(),
	lot: z.coerce
		.number({ error: 'A lot is given by its id.' })
		.int({ error: 'A lot is given by its id.' })
		.positive({ error: 'A lot is given by its id.' })
		.optional(),
	report: z
		.string()
		.trim()
		.max(60, { error: 'A report number has at most 60 characters.' })
		.optional(),
	sort: z
		.enum(WELD_LOG_SORTS, { error: `Sort by one of: ${WELD_LOG_SORTS.join(', ')}.` })
		.default('drawing'),
	dir: z.enum(['asc', 'desc'], { error: 'Direction is asc or desc.' }).default('asc')
});

export const weldLogQuery = weldLogFilter.extend({
	page: z.coerce
		.number({ error: 'The page is a whole number from 1.' })
		.int({ error: 'The page is a whole number from 1.' })
		.min(1, { error: 'The page is a whole number from 1.' })
		.default(1),
	pageSize: z.coerce
		.number({ error: `The page size is a whole number from 1 to ${WELD_LOG_MAX_PAGE_SIZE}.` })
		.int({ error: `The page size is a whole number from 1 to ${WELD_LOG_MAX_PAGE_SIZE}.` })
		.min(1, { error: `The page size is a whole number from 1 to ${WELD_LOG_MAX_PAGE_SIZE}.` })
		.max(WELD_LOG_MAX_PAGE_SIZE, {
			error: `The page size is a whole number from 1 to ${WELD_LOG_MAX_PAGE_SIZE}.`
		})
		.default(50)
});

export type WeldLogFilter = z.infer<typeof weldLogFilter>;
export type WeldLogQuery = z.infer<typeof weldLogQuery>;

/** An empty field of the filter form means "any", not a bad value. */
export function filled(params: Record<string, string>): Record<string, string> {
	return Object.fromEntries(Object.entries(params).filter(([, value]) => value.trim() !== ''));
}
