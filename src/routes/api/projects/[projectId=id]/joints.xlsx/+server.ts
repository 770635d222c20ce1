import { download } from '$lib/server/weld-log-download';
import type { RequestHandler } from './$types';

/** The whole filtered weld log as an Excel workbook, streamed; same filters as the JSON list. */
export const GET: RequestHandler = ({ locals, url }) => download(locals.projectId!, url, 'xlsx');
