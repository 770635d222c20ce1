import { sheetData } from '$lib/server/sheet-page';
import type { PageServerLoad } from './$types';

export const load = (async ({ locals, params }) =>
	sheetData(
		locals.projectId!,
		Number(params.drawingId),
		Number(params.revisionId)
	)) satisfies PageServerLoad;
