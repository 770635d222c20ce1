import { Readable } from 'node:stream';
import * as photos from '$lib/server/photos';
import * as storage from '$lib/server/storage';
import type { RequestHandler } from './$types';

/** The photo's thumbnail (WebP, at most 320 px), for the card's history. */
export const GET: RequestHandler = ({ params }) => {
	const photo = photos.get(Number(params.photoId))!;
	const body = Readable.toWeb(storage.read(photos.thumbKey(photo))) as ReadableStream;
	return new Response(body, {
		headers: {
			'content-type': 'image/webp',
			'content-length': String(photo.thumbBytes),
			'cache-control': 'private, max-age=86400'
		}
	});
};
