import { json } from '@sveltejs/kit';
import * as tiles from '$lib/server/tiles';
import type { RequestHandler } from './$types';

/** The project's sheets being prepared as tiles, and current revisions where that failed. */
export const GET: RequestHandler = ({ locals }) =>
	json(tiles.progress(locals.projectId!), { headers: { 'cache-control': 'no-store' } });
