import { Readable } from 'node:stream';
import * as exports from '$lib/server/exports';
import * as storage from '$lib/server/storage';
import { exportErrorResponse } from '$lib/server/export-errors';
import type { RequestHandler } from './$types';

/** The zip of a finished export, after the permission check in the hooks; never a static file. */
export const GET: RequestHandler = ({ params }) => {
	let file: ReturnType<typeof exports.fileOf>;
	try {
		file = exports.fileOf(Number(params.exportId));
	} catch (error) {
		return exportErrorResponse(error);
	}
	const stream = Readable.toWeb(storage.read(file.fileKey)) as ReadableStream;
	return new Response(stream, {
		headers: {
			'content-type': 'application/zip',
			'content-disposition': `attachment; filename="${file.fileName}"`,
			'content-length': String(file.bytes),
			etag: `"${file.sha256}"`,
			'cache-control': 'private, no-cache',
			'x-content-type-options': 'nosniff'
		}
	});
};
