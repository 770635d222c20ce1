/** How the exports API answers an expected failure of the exports module. */
import { json } from '@sveltejs/kit';
import { apiError } from './api';
import { ExportError } from './exports';

export function exportErrorResponse(error: unknown): Response {
	if (error instanceof ExportError) {
		return error.exportId !== undefined
			? json({ error: error.message, id: error.exportId }, { status: error.status })
			: apiError(error.status, error.message);
	}
	throw error;
}
