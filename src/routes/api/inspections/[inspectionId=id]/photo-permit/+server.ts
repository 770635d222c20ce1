import type { RequestHandler } from './$types';

/**
 * Asked by the upload middleware before it streams a photo to disk: the hooks have already
 * checked that the inspection exists and the caller may record inspections on its project.
 */
export const GET: RequestHandler = () => new Response(null, { status: 204 });
