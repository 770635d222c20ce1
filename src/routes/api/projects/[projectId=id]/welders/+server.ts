import { json } from '@sveltejs/kit';
import * as welders from '$lib/server/welders';
import type { RequestHandler } from './$types';

/** The project's welders with their stamps and qualified processes. */
export const GET: RequestHandler = ({ locals }) => json({ items: welders.list(locals.projectId!) });
