import { Readable } from 'node:stream';
import * as photos from '$lib/server/photos';
import * as storage from '$lib/server/storage';
import type { RequestHandler } from './$types';

/** The photo as stored (JPEG), after the same access check as its inspection. */
export const GET: RequestHandler = ({ params, request }) => {
	const photo = photos.get(Number(params.photoId))!;
	const etag = `"${photo.sha256}"`;
	const headers = {
		'content-type': 'image/jpeg',
		'content-disposition': `inline; filename="photo-${photo.id}.jpg"`,
		etag,
		'cache-control': 'private, max-age=86400'
	};
	if (request.headers.get('if-none-match') === etag)
		return new Response(null, { status: 304, headers });
	const body = Readable.toWeb(storage.read(photo.storageKey)) as ReadableStream;
	return new Response(body, { headers: { ...headers, 'content-length': String(photo.bytes) } });
};
