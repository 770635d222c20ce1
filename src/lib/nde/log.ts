/** The weld log's NDE filters, named once for the API, the page and the server. Pure. */
export const SELECTION_FILTERS = ['selected', 'sample', 'tracer', 'full', 'not-selected'] as const;
export type SelectionFilter = (typeof SELECTION_FILTERS)[number];

export const SELECTION_FILTER_WORDS: Record<SelectionFilter, string> = {
	selected: 'Selected for NDE (any reason)',
	sample: 'In the random sample',
	tracer: 'Tracers',
	full: '100 % of a welder’s work',
	'not-selected': 'In a lot, not selected'
};
