import { apiError } from '$lib/server/api';
import * as storage from '$lib/server/storage';
import * as tiles from '$lib/server/tiles';
import type { RequestHandler } from './$types';

const NUMBER = /^\d{1,5}$/;
const TILE = /^(\d{1,5})_(\d{1,5})\.([a-z]+)$/;

/** One tile image, under the same access rule as the revision's PDF (checked in the hooks). */
export const GET: RequestHandler = async ({ params, request }) => {
	const name = TILE.exec(params.tile);
	if (!NUMBER.test(params.page) || !NUMBER.test(params.level) || !name)
		return apiError(404, 'There is no such tile.');
	const found = tiles.tile(
		Number(params.revisionId),
		Number(params.page),
		Number(params.level),
		Number(name[1]),
		Number(name[2]),
		name[3]
	);
	if (!found) return apiError(404, 'This sheet has no such tile (or its tiles are not ready yet).');
	const headers = {
		'content-type': found.contentType,
		etag: found.etag,
		// Private: tiles are behind sign-in, as the PDF is; a stored copy is checked each time.
		'cache-control': 'private, no-cache',
		'x-content-type-options': 'nosniff'
	};
	if (request.headers.get('if-none-match') === found.etag)
		return new Response(null, { status: 304, headers });
	let bytes: Uint8Array;
	try {
		bytes = await storage.readAll(found.key);
	} catch {
		return apiError(404, 'This tile is missing on the server; the sheet opens without it.');
	}
	return new Response(bytes as BodyInit, {
		headers: { ...headers, 'content-length': String(bytes.byteLength) }
	});
};
