import { json } from '@sveltejs/kit';
import * as nde from '$lib/server/nde';
import type { RequestHandler } from './$types';

/** Repair rate of the project, each welder and each lot, on the joint and the length basis, each basis named. */
export const GET: RequestHandler = ({ locals }) =>
	json({ ...nde.repairRates(locals.projectId!), caution: nde.NDE_CAUTION });
