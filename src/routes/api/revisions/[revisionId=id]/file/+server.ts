import { Readable } from 'node:stream';
import * as drawings from '$lib/server/drawings';
import * as storage from '$lib/server/storage';
import type { RequestHandler } from './$types';

/** The PDF, after the permission check in the hooks; never a static file. */
export const GET: RequestHandler = ({ params, request }) => {
	const revision = drawings.revision(Number(params.revisionId))!;
	const etag = `"${revision.sha256}"`;
	const headers = {
		'content-type': 'application/pdf',
		'content-disposition': `inline; filename="${revision.fileName.replace(/[^A-Za-z0-9._-]/g, '_')}"`,
		etag,
		// Private: the file is behind sign-in; a stored copy is checked against the ETag.
		'cache-control': 'private, no-cache',
		'x-content-type-options': 'nosniff'
	};
	if (request.headers.get('if-none-match') === etag)
		return new Response(null, { status: 304, headers });
	const stream = Readable.toWeb(storage.read(revision.fileKey)) as ReadableStream;
	return new Response(stream, {
		headers: { ...headers, 'content-length': String(revision.bytes) }
	});
};
