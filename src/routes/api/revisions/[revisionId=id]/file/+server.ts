import { Readable } from 'node:stream';
import parseRange from 'range-parser';
import * as drawings from '$lib/server/drawings';
import * as storage from '$lib/server/storage';
import type { RequestHandler } from './$types';

/**
 * The PDF, after the permission check in the hooks; never a static file. A `Range` request
 * (one range) is answered with that part (206), so pdf.js can fetch a large sheet in pieces
 * and show the first page before the whole file has come; a range past the end is 416.
 */
export const GET: RequestHandler = ({ params, request }) => {
	const revision = drawings.revision(Number(params.revisionId))!;
	const etag = `"${revision.sha256}"`;
	const headers = {
		'content-type': 'application/pdf',
		'content-disposition': `inline; filename="${revision.fileName.replace(/[^A-Za-z0-9._-]/g, '_')}"`,
		etag,
		// Private: the file is behind sign-in; a stored copy is checked against the ETag.
		'cache-control': 'private, no-cache',
		'accept-ranges': 'bytes'
	};
	if (request.headers.get('if-none-match') === etag)
		return new Response(null, { status: 304, headers });
	const range = request.headers.get('range');
	const ifRange = request.headers.get('if-range');
	// A range of an older copy of the file would splice two files: send the whole one instead.
	if (range && (!ifRange || ifRange === etag)) {
		const ranges = parseRange(revision.bytes, range, { combine: true });
		if (ranges === -1)
			return new Response(null, {
				status: 416,
				headers: { ...headers, 'content-range': `bytes */${revision.bytes}` }
			});
		// A malformed header is ignored (RFC 9110 §14.2); several ranges get the whole file.
		if (ranges !== -2 && ranges.type === 'bytes' && ranges.length === 1) {
			const { start, end } = ranges[0];
			const part = Readable.toWeb(storage.read(revision.fileKey, { start, end })) as ReadableStream;
			return new Response(part, {
				status: 206,
				headers: {
					...headers,
					'content-range': `bytes ${start}-${end}/${revision.bytes}`,
					'content-length': String(end - start + 1)
				}
			});
		}
	}
	const stream = Readable.toWeb(storage.read(revision.fileKey)) as ReadableStream;
	return new Response(stream, {
		headers: { ...headers, 'content-length': String(revision.bytes) }
	});
};
