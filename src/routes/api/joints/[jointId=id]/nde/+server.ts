import { json } from '@sveltejs/kit';
import * as nde from '$lib/server/nde';
import type { RequestHandler } from './$types';

/** The joint's NDE lots: how it was selected (or why not), the tracers its reject called, and where it stands. */
export const GET: RequestHandler = ({ params }) => json(nde.forJoint(Number(params.jointId)));
