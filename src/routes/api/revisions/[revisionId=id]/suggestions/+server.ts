import { json } from '@sveltejs/kit';
import * as sheetReadings from '$lib/server/sheet-readings';
import type { RequestHandler } from './$types';

/**
 * The weld numbers found on the revision's sheets and not yet on the drawing:
 * `{ status, textLayer, items: [{ number, pageIndex, x, y, target }] }`, x, y at the printed
 * number in PDF points; `textLayer: false` for sheets with no text to read (scans).
 */
export const GET: RequestHandler = ({ params }) =>
	json(sheetReadings.suggestions(Number(params.revisionId)), {
		headers: { 'cache-control': 'no-store' }
	});

/** Read the sheets again (a revision stored before the reading existed): 202, then GET. */
export const POST: RequestHandler = ({ params }) => {
	const id = Number(params.revisionId);
	void sheetReadings.queue(id);
	return json(sheetReadings.suggestions(id), { status: 202 });
};
