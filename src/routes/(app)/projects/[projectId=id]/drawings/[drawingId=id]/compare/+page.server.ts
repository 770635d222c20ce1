import { error } from '@sveltejs/kit';
import { drawingOrThrow, revisionOrThrow } from '$lib/server/sheet-page';
import * as drawings from '$lib/server/drawings';
import type { PageServerLoad } from './$types';

/** `?a=<older revision>&b=<newer revision>`; by default the current one over the one before. */
export const load = (async ({ locals, params, url }) => {
	const drawing = drawingOrThrow(locals.projectId!, Number(params.drawingId));
	const revisions = drawings.history(drawing.id);
	if (revisions.length < 2)
		error(404, `${drawing.number} has only one revision, so there is nothing to compare.`);
	const pick = (name: 'a' | 'b', fallback: number) => {
		const wanted = Number(url.searchParams.get(name));
		return revisions.some((r) => r.id === wanted) ? wanted : fallback;
	};
	const b = pick('b', revisions[0].id);
	const a = pick('a', revisions.find((r) => r.id !== b)!.id);
	return {
		title: `Compare · ${drawing.number}`,
		drawing,
		revisions: revisions.map(({ id, label, status, issuedOn, uploadedAt }) => ({
			id,
			label,
			status,
			issuedOn,
			uploadedAt
		})),
		a: revisionOrThrow(a),
		b: revisionOrThrow(b)
	};
}) satisfies PageServerLoad;
