/** The weld log as a streamed file download, shared by the CSV and the Excel routes. */
import { PassThrough, Readable } from 'node:stream';
import * as weldLog from './weld-log';
import * as projects from './projects';
import { apiError, invalid, queryOf } from './api';
import { filled, weldLogFilter } from '$lib/schemas/weld-log';

const TYPES = {
	csv: 'text/csv; charset=utf-8',
	xlsx: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet'
} as const;

export function download(projectId: number, url: URL, format: 'csv' | 'xlsx'): Response {
	const filter = weldLogFilter.safeParse(filled(queryOf(url)));
	if (!filter.success) return invalid(filter);
	const project = projects.get(projectId);
	if (!project) return apiError(404, 'There is no such project.');
	const stream = new PassThrough();
	const rows = weldLog.iterate(projectId, filter.data);
	const writing =
		format === 'csv' ? weldLog.writeCsv(rows, stream) : weldLog.writeXlsx(rows, stream);
	// Headers are gone by the time a row fails, so the broken stream is how the client learns.
	writing.catch((error: unknown) =>
		stream.destroy(error instanceof Error ? error : new Error(String(error)))
	);
	return new Response(Readable.toWeb(stream) as ReadableStream<Uint8Array>, {
		headers: {
			'content-type': TYPES[format],
			'content-disposition': `attachment; filename="${weldLog.fileName(project.code, format)}"`,
			'cache-control': 'no-store'
		}
	});
}
