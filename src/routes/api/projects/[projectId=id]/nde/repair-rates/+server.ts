import { json } from '@sveltejs/kit';
import * as nde from '$lib/server/nde';
import { JOINT_BASIS, LENGTH_BASIS } from '$lib/nde/repair-rate';
import type { RequestHandler } from './$types';

/** Repair rate of the project, each welder and each lot, on the joint and the length basis. */
export const GET: RequestHandler = ({ locals }) => {
	const projectId = locals.projectId!;
	const stamps = new Map(nde.welderStamps(projectId).map((w) => [w.id, w.stamp]));
	return json({
		bases: { joint: JOINT_BASIS, length: LENGTH_BASIS },
		project: nde.projectRate(projectId),
		welders: [...nde.welderRates(projectId)].map(([id, rate]) => ({
			stamp: stamps.get(id) ?? String(id),
			...rate
		})),
		lots: nde.lotRates(projectId),
		caution: nde.NDE_CAUTION
	});
};
