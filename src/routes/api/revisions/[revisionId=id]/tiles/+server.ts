import { json } from '@sveltejs/kit';
import * as tiles from '$lib/server/tiles';
import type { RequestHandler } from './$types';

/**
 * The tile pyramid of each sheet of the revision (after the permission check in the hooks).
 * Asking is also a view: sheets without tiles yet are queued.
 */
export const GET: RequestHandler = ({ params }) => {
	const revisionId = Number(params.revisionId);
	tiles.ensure(revisionId);
	return json({ items: tiles.index(revisionId) }, { headers: { 'cache-control': 'no-store' } });
};
