/**
 * Joints that name a WPS of the register: the picker's rule (approved WPSs of the project
 * only), range flags in the joint API, a fit-up judged on the server against the WPS joint
 * design as well as the code, welds refused for a process the WPS does not list (an
 * administrator may override with a reason), and the evaluate API with `wps`.
 *
 * The WPS is invented. Code limits: ASME B31.3-2018 328.4.2 leaves the joint preparation to
 * the WPS (common practice for the bevel and gap); ASME B16.25-2017 sets 37.5° ± 2.5° [2+].
 */
import { beforeAll, describe, expect, it } from 'vitest';
import * as joints from '$lib/server/joints';
import * as inspections from '$lib/server/inspections';
import * as welds from '$lib/server/welds';
import * as users from '$lib/server/users';
import * as wps from '$lib/server/wps';
import { DomainError } from '$lib/server/errors';
import { emptyWps } from '$lib/wps-register';
import { recordInspectionSchema, recordWeldSchema } from '$lib/schemas/inspection';
import { POST as evaluatePost } from '../../src/routes/api/acceptance/evaluate/+server';
import { makeProject, type MadeProject } from '../fixtures/projects';
import { makeJoint } from '../fixtures/joints';
import { qualifiedWelder } from '../fixtures/welders';

let job: MadeProject;
let approvedId: number;
let supersededId: number;

// A 6 in SCH 40 butt weld: OD 6.625 in (168.3 mm), Tw 0.280 in (7.11 mm), ASME B36.10M.
const DESIGN = {
	processes: 'GTAW/SMAW',
	materialGroups: 'P1',
	thicknessMin: '1/8',
	thicknessMax: '3/4',
	diameterMin: '2',
	rootOpeningMin: '1/16',
	rootOpeningMax: '1/8',
	rootFaceMin: '1/32',
	rootFaceMax: '3/32',
	bevelAngleMin: '35',
	bevelAngleMax: '40'
};

beforeAll(async () => {
	job = await makeProject({ units: 'imperial' });
	approvedId = wps.create(
		job.projectId,
		{ ...emptyWps(), ...DESIGN, number: 'WPS-J-01', revision: '2', status: 'approved' },
		job.users.admin
	).id;
	supersededId = wps.create(
		job.projectId,
		{ ...emptyWps(), ...DESIGN, number: 'WPS-J-01', revision: '1', status: 'superseded' },
		job.users.admin
	).id;
});

const refusal = (work: () => unknown) => {
	try {
		work();
	} catch (error) {
		if (error instanceof DomainError) return error;
		throw error;
	}
	throw new Error('not refused');
};

function jointNaming(wpsId: number | null, fields: object = {}) {
	const { joint } = makeJoint(job.drawing, {
		wps: '',
		criteriaSetId: 'asme-b31.3-normal',
		...fields
	});
	if (wpsId === null) return joint;
	return joints.update(joint.id, { wpsId, version: joint.version }, job.users.inspector);
}

describe('a joint names its WPS from the register', () => {
	it('takes an approved WPS, its number becoming the WPS text', () => {
		const joint = jointNaming(approvedId);
		expect(joint.wpsId).toBe(approvedId);
		expect(joint.wps).toBe('WPS-J-01');
		const detail = joints.detail(joint.id)!;
		expect(detail.wpsEntry).toMatchObject({ label: 'WPS-J-01 rev 2', processes: ['GTAW', 'SMAW'] });
		// A superseded WPS is not offered.
		expect(detail.wpsChoices.map((c) => c.label)).toEqual(['WPS-J-01 rev 2']);
	});

	it('refuses a superseded WPS, and one of another project', async () => {
		const other = await makeProject();
		const elsewhere = wps.create(
			other.projectId,
			{ ...emptyWps(), ...DESIGN, number: 'WPS-X', revision: '0', status: 'approved' },
			other.users.admin
		);
		for (const wpsId of [supersededId, elsewhere.id]) {
			const joint = jointNaming(null);
			const error = refusal(() =>
				joints.update(joint.id, { wpsId, version: joint.version }, job.users.inspector)
			);
			expect([error.status, error.field]).toEqual([400, 'wpsId']);
		}
	});

	it('flags a joint outside the WPS thickness, diameter or group, in the joint API', () => {
		expect(joints.detail(jointNaming(approvedId).id)!.wpsFlags).toEqual([]);
		// 1 in SCH 80: OD 1.315 in, under the WPS's 2 in.
		const small = jointNaming(approvedId, { size: '1', thickness: '0.179 in' });
		expect(joints.detail(small.id)!.wpsFlags.map((f) => f.field)).toEqual(['diameter']);
		const thick = jointNaming(approvedId, { thickness: '1 in' });
		expect(joints.detail(thick.id)!.wpsFlags.map((f) => f.field)).toEqual(['thickness']);
		// ASME IX QW/QB-422: A312 TP316L is P-No. 8, not the WPS's P-No. 1.
		const stainless = jointNaming(approvedId, { material: 'ASTM A312 TP316L' });
		const flags = joints.detail(stainless.id)!.wpsFlags;
		expect(flags.map((f) => f.field)).toEqual(['material']);
		expect(flags[0].message).toContain('WPS WPS-J-01 rev 2');
	});
});

describe('a fit-up judged against the joint WPS on the server', () => {
	const fitup = (jointId: number, readings: object) =>
		inspections.record(
			jointId,
			recordInspectionSchema.parse({
				version: joints.row(jointId)!.version,
				stage: 'fitup',
				readings,
				decision: 'accept',
				reason: 'Checked against the WPS by the inspector on site.'
			}),
			job.users.inspector
		).inspection;

	it('is within inside the WPS ranges, the clause naming the WPS', () => {
		const joint = jointNaming(approvedId);
		const record = fitup(joint.id, {
			rootOpening: '1/8',
			rootFace: '1/16',
			bevelAngle: '37.5',
			misalignment: '1/32'
		});
		const root = record.findings.find((f) => f.check === 'wps.rootOpening')!;
		expect(root).toMatchObject({ outcome: 'within', clause: 'WPS WPS-J-01 rev 2' });
		const ofWps = record.findings.filter((f) => f.check.startsWith('wps.'));
		expect(ofWps.map((f) => f.outcome)).toEqual(['within', 'within', 'within']);
		expect(record.verdict).not.toBe('outside');
	});

	it('is outside past a WPS max, though the code leaves the gap to the WPS', () => {
		const joint = jointNaming(approvedId);
		const record = fitup(joint.id, {
			rootOpening: '5/32',
			rootFace: '1/16',
			bevelAngle: '37.5',
			misalignment: '1/32'
		});
		expect(record.findings.find((f) => f.check === 'wps.rootOpening')?.outcome).toBe('outside');
		expect(record.verdict).toBe('outside');
	});

	it('judges a joint with no WPS by the code alone', () => {
		const joint = jointNaming(null);
		const record = fitup(joint.id, {
			rootOpening: '5/32',
			rootFace: '1/16',
			bevelAngle: '37.5',
			misalignment: '1/32'
		});
		expect(record.findings.some((f) => f.check.startsWith('wps.'))).toBe(false);
	});
});

describe('a weld against the joint WPS', () => {
	const weld = (jointId: number, process: string | undefined, userId: string, override?: string) =>
		welds.record(
			jointId,
			recordWeldSchema.parse({
				version: joints.row(jointId)!.version,
				weldedOn: '2025-06-02',
				welders: { root: stamp, fill: stamp, cap: stamp },
				...(process ? { process } : {}),
				...(override ? { override: { reason: override } } : {})
			}),
			users.principal(userId)!
		);
	/** A joint naming the WPS, its fit-up accepted so it may be welded. */
	const fitted = (wpsId: number) => {
		const joint = jointNaming(wpsId);
		inspections.record(
			joint.id,
			recordInspectionSchema.parse({
				version: joints.row(joint.id)!.version,
				stage: 'fitup',
				readings: {
					rootOpening: '1/8',
					rootFace: '1/16',
					bevelAngle: '37.5',
					misalignment: '1/32'
				},
				decision: 'accept',
				reason: 'Checked against the WPS by the inspector on site.'
			}),
			job.users.inspector
		);
		return joint;
	};
	let stamp: string;
	beforeAll(() => {
		stamp = qualifiedWelder(job.projectId);
	});

	it('takes the WPS processes by default and names the WPS on the weld', () => {
		const joint = fitted(approvedId);
		const { weld: made } = weld(joint.id, undefined, job.users.foreman);
		expect(made.wps).toBe('WPS-J-01 rev 2');
		expect(made.process).toBe('GTAW/SMAW');
	});

	it('refuses a process the WPS does not list; an administrator records it with a reason', () => {
		// The welder is qualified GTAW and SMAW; this WPS lists GTAW only.
		const gtawOnly = wps.create(
			job.projectId,
			{
				...emptyWps(),
				...DESIGN,
				processes: 'GTAW',
				number: 'WPS-J-02',
				revision: '0',
				status: 'approved'
			},
			job.users.admin
		);
		const joint = fitted(gtawOnly.id);
		const error = refusal(() => weld(joint.id, 'GTAW/SMAW', job.users.foreman));
		expect(error.message).toContain('WPS WPS-J-02 rev 0 does not list SMAW');
		expect([error.status, error.field]).toEqual([409, 'process']);
		expect(error.message).toContain('WPS WPS-J-02 rev 0 does not list SMAW');
		const foremanOverride = refusal(() =>
			weld(joint.id, 'GTAW/SMAW', job.users.foreman, 'Client approved the SMAW fill by letter.')
		);
		expect(foremanOverride.status).toBe(403);
		const { weld: recorded } = weld(
			joint.id,
			'GTAW/SMAW',
			job.users.admin,
			'Client approved the SMAW fill by letter.'
		);
		expect(recorded.overrideReason).toBe('Client approved the SMAW fill by letter.');
	});
});

describe('POST /api/acceptance/evaluate with wps', () => {
	const post = (body: object) =>
		(evaluatePost as unknown as (e: never) => Promise<Response>)({
			request: new Request('http://localhost/api/acceptance/evaluate', {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body: JSON.stringify(body)
			}),
			locals: { user: users.principal(job.users.inspector) }
		} as never);
	const body = (wpsNumber: string, rootOpening: string) => ({
		criteria: 'asme-b31.3-normal',
		projectId: job.projectId,
		stage: 'fitup',
		units: 'imperial',
		wps: wpsNumber,
		joint: { kind: 'butt', thickness: '0.280 in', diameter: '6.625 in' },
		readings: { rootOpening, rootFace: '1/16', bevelAngle: '37.5', misalignment: '1/32' }
	});

	it.each([
		['1/16', 'within'],
		['1/8', 'within'],
		['3/64', 'outside'],
		['9/64', 'outside']
	])('root opening %s in against WPS 1/16–1/8 in is %s', async (rootOpening, outcome) => {
		const response = await post(body('wps-j-01', rootOpening));
		expect(response.status).toBe(200);
		const answer = await response.json();
		const finding = answer.findings.find((f: { check: string }) => f.check === 'wps.rootOpening');
		expect(finding).toMatchObject({ outcome, clause: 'WPS WPS-J-01 rev 2' });
	});

	it('answers 400 for a WPS the register does not have, or without the project', async () => {
		const unknown = await post(body('WPS-NONE', '1/8'));
		expect(unknown.status).toBe(400);
		expect((await unknown.json()).field).toBe('wps');
		const { projectId: _projectId, ...noProject } = body('WPS-J-01', '1/8');
		const without = await post(noProject);
		expect(without.status).toBe(400);
		expect((await without.json()).field).toBe('projectId');
	});
});

describe('the weld log', () => {
	it('names the register WPS of a joint by number and revision', async () => {
		const { weldLogQuery } = await import('$lib/schemas/weld-log');
		const weldLog = await import('$lib/server/weld-log');
		const joint = jointNaming(approvedId);
		const rows = [...weldLog.iterate(job.projectId, weldLogQuery.parse({}))];
		expect(rows.find((r) => r.id === joint.id)?.wps).toBe('WPS-J-01 rev 2');
	});
});
