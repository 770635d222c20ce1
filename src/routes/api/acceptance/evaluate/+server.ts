import { json } from '@sveltejs/kit';
import {
	acceptanceNotice,
	builtInCriteriaSetIds,
	evaluate,
	evaluateIndications,
	getCriteriaSet
} from '$lib/acceptance';
import { isMember } from '$lib/permissions';
import { apiError, invalid } from '$lib/server/api';
import { readJson } from '$lib/server/api-body';
import * as criteriaSets from '$lib/server/criteria-sets';
import * as wpsRegister from '$lib/server/wps';
import { jointDesign } from '$lib/wps-register';
import { evaluateIndicationsSchema, evaluateRequestSchema } from '$lib/schemas/acceptance';
import type { RequestHandler } from './$types';

const EXAMPLE =
	'{ "criteria": "aws-d1.1-static", "stage": "visual", "joint": { "kind": "butt", "thickness": "3/4 in" }, "readings": { "undercutDepth": "1/32" } }';

/**
 * The verdict for one set of readings, from the same engine the joint card runs in the browser.
 * Nothing is stored: recording an inspection belongs to the inspection routes. With `projectId`
 * the criteria may also be one of that project's own sets (latest version). With stage `nde`,
 * the indications of an RT or UT report are judged by the set's criteria for them. With
 * `projectId` and `wps` (a WPS number of that project's register, `wpsRevision` optional), a
 * fit-up is also judged against that WPS's joint design (clause "WPS {number} rev {rev}").
 */
export const POST: RequestHandler = async ({ request, locals }) => {
	const read = await readJson(request);
	if ('response' in read)
		return read.response.status === 413
			? read.response
			: apiError(400, `The body is not JSON. Send ${EXAMPLE}.`, 'body');
	const body = read.body;
	if (typeof body !== 'object' || body === null || Array.isArray(body)) {
		return apiError(400, `The body must be a JSON object, such as ${EXAMPLE}.`, 'body');
	}
	const nde = 'stage' in body && body.stage === 'nde';
	const parsed = nde
		? evaluateIndicationsSchema.safeParse(body)
		: evaluateRequestSchema.safeParse(body);
	if (!parsed.success) return invalid(parsed);

	const { criteria, projectId, units, joint } = parsed.data;
	if (projectId !== undefined && !(locals.user && isMember(locals.user, projectId))) {
		return apiError(404, 'There is no such project, or you are not a member of it.', 'projectId');
	}
	const set =
		projectId === undefined ? getCriteriaSet(criteria) : criteriaSets.resolve(projectId, criteria);
	if (!set) {
		const known =
			projectId === undefined
				? builtInCriteriaSetIds
				: criteriaSets.choices(projectId).map((choice) => choice.id);
		return apiError(
			400,
			`Unknown criteria set "${criteria}"; use one of: ${known.join(', ')}.`,
			'criteria'
		);
	}
	if (parsed.data.stage === 'nde') {
		const { method, indications } = parsed.data;
		const judged = evaluateIndications(set, joint, method, indications, { units });
		if (!judged.ok) {
			const [first] = judged.errors;
			return apiError(400, first.message, first.field);
		}
		return json({
			verdict: judged.verdict,
			criteria: judged.criteria,
			units,
			method: judged.method,
			findings: judged.findings,
			missingJoint: judged.missingJoint,
			indications: judged.indications,
			...(judged.note ? { note: judged.note } : {}),
			notice: acceptanceNotice
		});
	}
	const { stage, readings, wps: wpsNumber, wpsRevision } = parsed.data;
	let wps;
	if (wpsNumber !== undefined) {
		if (projectId === undefined) {
			return apiError(400, 'Give the projectId whose WPS register names the WPS.', 'projectId');
		}
		const found = wpsRegister.byNumber(projectId, wpsNumber, wpsRevision);
		if (!found) {
			return apiError(
				400,
				wpsRevision === undefined
					? `The project's register has no approved WPS "${wpsNumber}".`
					: `The project's register has no WPS "${wpsNumber}" rev ${wpsRevision}.`,
				'wps'
			);
		}
		wps = jointDesign(found);
	}
	const result = evaluate(set, joint, stage, readings, { units, wps });
	if (!result.ok) {
		const [first] = result.errors;
		return apiError(400, first.message, first.field);
	}
	const { verdict, findings, missing, missingJoint, derived } = result;
	return json({
		verdict,
		criteria: result.criteria,
		units,
		findings,
		missing,
		missingJoint,
		derived,
		notice: acceptanceNotice
	});
};
