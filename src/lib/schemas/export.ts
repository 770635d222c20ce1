/** What a turnover set covers: shared by the scope page, the exports API and the tests. */
import { z } from 'zod';
import type { StateCounts } from '$lib/state-counts';

const id = z.coerce.number().int().positive();

export const exportScopeSchema = z
	.object({
		drawings: z.array(id).min(1, { error: 'Choose at least one drawing.' }).max(5000).optional(),
		area: z.string().trim().min(1).max(80).optional(),
		system: z.string().trim().min(1).max(80).optional(),
		all: z.literal(true).optional()
	})
	.refine(
		(s) => [s.drawings, s.area, s.system, s.all].filter((v) => v !== undefined).length === 1,
		{ error: 'Choose one scope: the whole project, some drawings, an area or a system.' }
	);

export const exportRequestSchema = z.object({
	scope: exportScopeSchema,
	includeSuperseded: z.boolean().default(false),
	acceptedOnly: z.boolean().default(false)
});

export type ExportScope = z.infer<typeof exportScopeSchema>;
export type ExportRequest = z.infer<typeof exportRequestSchema>;

const flag = (value: string | null) => ['1', 'true', 'on'].includes(value ?? '');

/**
 * The same request as query parameters, for the preview and the scope page:
 * `?scope=all|drawings|area|system&drawing=3&drawing=5&area=…&system=…&superseded=1&accepted=1`.
 */
export function exportRequestFromQuery(params: URLSearchParams) {
	const kind = params.get('scope') ?? 'all';
	const scope =
		kind === 'drawings'
			? { drawings: params.getAll('drawing') }
			: kind === 'area'
				? { area: params.get('area') ?? '' }
				: kind === 'system'
					? { system: params.get('system') ?? '' }
					: { all: true };
	return exportRequestSchema.safeParse({
		scope,
		includeSuperseded: flag(params.get('superseded')),
		acceptedOnly: flag(params.get('accepted'))
	});
}

/** The inverse of `exportRequestFromQuery`: the query that previews the same set again. */
export function exportRequestToQuery(request: ExportRequest): string {
	const params = new URLSearchParams();
	const { scope } = request;
	if (scope.drawings) {
		params.set('scope', 'drawings');
		for (const id of scope.drawings) params.append('drawing', String(id));
	} else if (scope.area) {
		params.set('scope', 'area');
		params.set('area', scope.area);
	} else if (scope.system) {
		params.set('scope', 'system');
		params.set('system', scope.system);
	} else params.set('scope', 'all');
	if (request.includeSuperseded) params.set('superseded', '1');
	if (request.acceptedOnly) params.set('accepted', '1');
	return `?${params}`;
}

/** The scope in words, for the cover sheet, the history and the notice. */
export function describeScope(scope: ExportScope, drawingCount: number): string {
	if (scope.all) return 'Whole project';
	if (scope.area) return `Area ${scope.area}`;
	if (scope.system) return `System / test pack ${scope.system}`;
	return `${drawingCount} chosen drawing${drawingCount === 1 ? '' : 's'}`;
}

/** What a set would hold, shown before the job starts. */
export interface ExportPreview {
	drawings: number;
	revisions: number;
	sheets: number;
	joints: StateCounts;
	/** Live joints in scope that are not accepted yet. */
	notAccepted: number;
	/** Pins on current sheets in scope that still wait for review after a new revision. */
	pinsToReview: number;
}
