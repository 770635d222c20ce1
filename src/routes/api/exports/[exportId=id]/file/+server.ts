import { Readable } from 'node:stream';
import { json } from '@sveltejs/kit';
import * as exports from '$lib/server/exports';
import * as storage from '$lib/server/storage';
import { apiFailure } from '$lib/server/errors';
import type { RequestHandler } from './$types';

/** The zip of a finished export, after the permission check in the hooks; never a static file. */
export const GET: RequestHandler = ({ params }) => {
	let file: ReturnType<typeof exports.fileOf>;
	try {
		file = exports.fileOf(Number(params.exportId));
	} catch (error) {
		return apiFailure(error);
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

/**
 * Remove the zip of a finished export ahead of `EXPORT_KEEP_DAYS`; its record, size and
 * SHA-256 stay in the history. A running export answers 409 (cancel it instead).
 */
export const DELETE: RequestHandler = async ({ params, locals }) => {
	try {
		return json(await exports.removeFile(Number(params.exportId), locals.user!.id));
	} catch (error) {
		return apiFailure(error);
	}
};
