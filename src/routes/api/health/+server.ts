import { json } from '@sveltejs/kit';
import { health } from '$lib/server/db/health';
import type { RequestHandler } from './$types';

/** Up once the database is open and migrated; 503 when it cannot answer. */
export const GET: RequestHandler = () => {
	const result = health();
	return json(result.ok ? { status: 'ok' } : { status: 'unavailable', error: result.error }, {
		status: result.ok ? 200 : 503,
		headers: { 'cache-control': 'no-store' }
	});
};
