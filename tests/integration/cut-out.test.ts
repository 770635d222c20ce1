/**
 * Cut-outs and corrections on the joint card, through the server modules and the API routes,
 * against a real SQLite file with a project made by the test factory. Limits are ASME B31.3-2018 normal fluid
 * service as the engine's set gives them (reference/standards.md §2): undercut at most the
 * lesser of 1 mm (1/32 in) and Tw/4, Table 341.3.2 criterion H.
 */
import { and, eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { db, schema } from '$lib/server/db';
import * as joints from '$lib/server/joints';
import * as inspections from '$lib/server/inspections';
import * as audit from '$lib/server/audit';
import * as users from '$lib/server/users';
import { ruleFor } from '$lib/server/route-access';
import { can } from '$lib/permissions';
import { deriveJointState } from '$lib/joint-state';
import { recordInspectionSchema } from '$lib/schemas/inspection';
import type { JointFields } from '$lib/schemas/joint';
import { POST as postCutOut } from '../../src/routes/api/joints/[jointId=id]/cut-out/+server';
import { POST as postInspection } from '../../src/routes/api/joints/[jointId=id]/inspections/+server';
import { makeProject, type MadeProject } from '../fixtures/projects';
import { weldJoint } from '../fixtures/welders';
import { FITUP, OUTSIDE, WITHIN } from '../fixtures/readings';
import { countsTable, directCounts } from '../fixtures/state-counts';

type Handler = (event: never) => Response | Promise<Response>;

let inspectorId: string;
let foremanId: string;
let projectId: number;
let drawingId: number;
let revisionId: number;
let members: MadeProject['users'];

beforeAll(async () => {
	const job = await makeProject();
	members = job.users;
	({ inspector: inspectorId, foreman: foremanId } = job.users);
	({ projectId, drawingId, revisionId } = job.drawing);
});

// Factories ----------------------------------------------------------------------------------

let placed = 0;
/** A butt joint on the inch project: 6 in SCH 40, Tw = 0.280 in, ASME B31.3 normal, RT 100 %. */
function newJoint(fields: Partial<JointFields> = {}, number?: string) {
	placed++;
	return joints.place(
		{
			revisionId,
			pageIndex: 0,
			x: 120 + placed * 4.5,
			y: 640.25,
			number,
			joint: {
				kind: 'butt',
				location: 'field',
				line: '6"-PW-2051-A1',
				spool: 'SP-07',
				size: '6',
				thickness: '0.280 in',
				material: 'A106 Gr. B',
				criteriaSetId: 'asme-b31.3-normal',
				wps: 'WPS-CS-01 GTAW/SMAW',
				ndeRequired: 'RT',
				...fields
			}
		},
		inspectorId
	).joint;
}

const inspect = (jointId: number, body: unknown) =>
	inspections.record(
		jointId,
		recordInspectionSchema.parse({ version: joints.row(jointId)!.version, ...(body as object) }),
		inspectorId
	);

/** A joint welded and rejected at visual: in repair. */
function jointInRepair(fields: Partial<JointFields> = {}, number?: string) {
	const joint = newJoint(fields, number);
	inspect(joint.id, { stage: 'fitup', readings: FITUP, decision: 'accept' });
	weldJoint(projectId, joint.id, foremanId);
	const rejected = inspect(joint.id, { stage: 'visual', readings: OUTSIDE, decision: 'reject' });
	expect(rejected.joint.state).toBe('repair');
	return joints.row(joint.id)!;
}

function expectCacheAgrees(jointId: number) {
	const cached = joints.row(jointId)!;
	expect({ state: cached.state, repairCycle: cached.repairCycle }).toEqual(
		deriveJointState(joints.stateInput(jointId)!)
	);
	return cached;
}

async function call(handler: unknown, jointId: number, userId: string, body: unknown) {
	const response = await (handler as Handler)({
		params: { jointId: String(jointId) },
		request: new Request(`http://localhost/api/joints/${jointId}`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify(body)
		}),
		locals: { user: users.principal(userId) }
	} as never);
	return { status: response.status, body: await response.json() };
}

const jointsOnDrawing = () =>
	db.select().from(schema.joints).where(eq(schema.joints.drawingId, drawingId)).all();
const pinsOf = (jointId: number) =>
	db.select().from(schema.pins).where(eq(schema.pins.jointId, jointId)).all();

// Cut-outs -----------------------------------------------------------------------------------

describe('cutting out a joint', () => {
	it('voids it and pins a joint with the N-suffixed number at the same point, same properties', async () => {
		const old = jointInRepair({ requiredSize: '' });
		const [oldPin] = pinsOf(old.id);
		const answer = await call(postCutOut, old.id, inspectorId, {
			reason: 'RT reject after R2, cut out on QC instruction',
			version: old.version
		});
		expect(answer.status).toBe(201);
		// Common practice (contractors' weld numbering procedures): a cut-out's replacement keeps
		// the number with an N suffix.
		expect(answer.body.joint.number).toBe(`${old.number}N`);
		expect(answer.body.replaced).toEqual({ id: old.id, number: old.number });

		const voided = expectCacheAgrees(old.id);
		expect(voided.state).toBe('void');
		expect(voided.voidReason).toBe(
			`Cut out: RT reject after R2, cut out on QC instruction; replaced by ${old.number}N`
		);
		expect(voided.voidedBy).toBe(inspectorId);

		const replacement = expectCacheAgrees(answer.body.joint.id);
		expect(replacement.state).toBe('awaiting_fitup');
		expect(replacement.repairCycle).toBe(0);
		expect(replacement.replacesJointId).toBe(old.id);
		const carried = [
			'projectId',
			'drawingId',
			'kind',
			'location',
			'line',
			'spool',
			'sizeText',
			'diameterMm',
			'thicknessText',
			'thicknessMm',
			'requiredSizeText',
			'requiredSizeMm',
			'material',
			'wps',
			'criteriaSetId',
			'ndeRequired'
		] as const;
		for (const key of carried) expect(replacement[key], key).toEqual(old[key]);
		expect(replacement.sizeText).toBe('6');
		expect(replacement.ndeRequired).toBe('RT');

		const [newPin] = pinsOf(replacement.id);
		expect(newPin).toMatchObject({
			revisionId,
			pageIndex: oldPin.pageIndex,
			x: oldPin.x,
			y: oldPin.y,
			needsReview: false
		});
		// The new joint carries no record of the old one: its history starts at fit-up.
		expect(inspections.list(replacement.id)).toEqual([]);
		expect(inspections.list(old.id)).toHaveLength(2);

		const oldDetail = joints.detail(old.id)!;
		const newDetail = joints.detail(replacement.id)!;
		expect(oldDetail.replacedBy).toEqual({ id: replacement.id, number: `${old.number}N` });
		expect(newDetail.replaces).toEqual({ id: old.id, number: old.number });
		const cutAudit = oldDetail.changes.at(-1)!;
		expect(cutAudit).toMatchObject({
			action: 'cut_out',
			after: {
				reason: 'RT reject after R2, cut out on QC instruction',
				replacedBy: { id: replacement.id }
			},
			before: { state: 'repair' }
		});
		const createAudit = newDetail.changes.find((c) => c.action === 'create')!;
		expect(createAudit).toMatchObject({
			after: { number: `${old.number}N`, replaces: { id: old.id }, x: oldPin.x, y: oldPin.y }
		});
		expect(createAudit.at).toBe(cutAudit.at);
		// The per-drawing counts the board and the summary read follow the void and the new joint.
		expect(countsTable()).toEqual(directCounts());
	});

	it('refuses to cut out a void joint twice, and a stale version, changing nothing', async () => {
		const old = jointInRepair();
		const first = joints.cutOut(old.id, 'Cut out after R2 failed RT', old.version, inspectorId);
		const plainVoid = newJoint();
		joints.voidJoint(
			plainVoid.id,
			'Deleted by field change FCR-88',
			plainVoid.version,
			inspectorId
		);
		const before = jointsOnDrawing().length;
		const again = await call(postCutOut, old.id, inspectorId, {
			reason: 'Cut out again',
			version: first.voided.version
		});
		expect(again.status).toBe(409);
		expect(again.body.error).toMatch(`already been cut out and replaced by ${old.number}N`);
		const stale = await call(postCutOut, old.id, inspectorId, {
			reason: 'Cut out again',
			version: old.version
		});
		expect(stale.status).toBe(409);
		expect(stale.body).toMatchObject({ field: 'version' });
		expect(stale.body.error).toMatch(/Someone else changed joint/);

		const voidAnswer = await call(postCutOut, plainVoid.id, inspectorId, {
			reason: 'Cut out',
			version: plainVoid.version + 1
		});
		expect(voidAnswer.status).toBe(409);
		expect(voidAnswer.body.error).toMatch(/is void/);
		expect(jointsOnDrawing().length).toBe(before);
	});

	it('never reuses a number: skips one taken by hand, and numbers a second cut-out N2', () => {
		const base = `${700 + placed}`;
		const old = jointInRepair({}, base);
		newJoint({}, `${base}N`);
		const first = joints.cutOut(old.id, 'RT reject after R1', old.version, inspectorId);
		expect(first.joint.number).toBe(`${base}N2`);

		inspect(first.joint.id, { stage: 'fitup', readings: FITUP, decision: 'accept' });
		weldJoint(projectId, first.joint.id, foremanId, '2025-06-09');
		const rejected = inspect(first.joint.id, {
			stage: 'visual',
			readings: OUTSIDE,
			decision: 'reject'
		});
		const second = joints.cutOut(
			first.joint.id,
			'Cut out again on client request',
			rejected.joint.version,
			inspectorId
		);
		expect(second.joint.number).toBe(`${base}N3`);
		const numbers = jointsOnDrawing().map((j) => j.number.toUpperCase());
		expect(new Set(numbers).size).toBe(numbers.length);
	});

	it('refuses a joint never welded: nothing to cut out', async () => {
		const joint = newJoint();
		const answer = await call(postCutOut, joint.id, inspectorId, {
			reason: 'Wrong branch',
			version: joint.version
		});
		expect(answer.status).toBe(409);
		expect(answer.body.error).toMatch(/has not been welded/);
		expect(expectCacheAgrees(joint.id).state).toBe('awaiting_fitup');
	});

	it('asks for a reason (400 naming the field)', async () => {
		const joint = jointInRepair();
		const answer = await call(postCutOut, joint.id, inspectorId, { reason: ' ', version: 1 });
		expect(answer.status).toBe(400);
		expect(answer.body.field).toBe('reason');
		expect(joints.row(joint.id)!.voidedAt).toBeNull();
	});

	it('writes all or nothing: a failure after the void leaves the joint as it was', () => {
		const old = jointInRepair();
		const count = jointsOnDrawing().length;
		const spy = vi.spyOn(audit, 'record').mockImplementation((entry) => {
			if (entry.action === 'create') throw new Error('disk full');
		});
		try {
			expect(() => joints.cutOut(old.id, 'RT reject', old.version, inspectorId)).toThrow(
				'disk full'
			);
		} finally {
			spy.mockRestore();
		}
		const after = expectCacheAgrees(old.id);
		expect(after.voidedAt).toBeNull();
		expect(after.state).toBe('repair');
		expect(after.version).toBe(old.version);
		expect(jointsOnDrawing().length).toBe(count);
		expect(
			db
				.select()
				.from(schema.joints)
				.where(
					and(eq(schema.joints.drawingId, drawingId), eq(schema.joints.replacesJointId, old.id))
				)
				.all()
		).toEqual([]);
	});

	it('is the inspector’s and the QC manager’s: the route asks joint.cutout', () => {
		expect(ruleFor('/api/joints/[jointId=id]/cut-out', 'POST', '')).toEqual({
			access: 'project',
			action: 'joint.cutout'
		});
		const principal = (role: keyof MadeProject['users']) => users.principal(members[role])!;
		expect(can(principal('inspector'), 'joint.cutout', projectId)).toBe(true);
		expect(can(principal('admin'), 'joint.cutout', projectId)).toBe(true);
		for (const role of ['foreman', 'doc_controller', 'turnover', 'viewer'] as const) {
			expect(can(principal(role), 'joint.cutout', projectId), role).toBe(false);
		}
	});
});

// Corrections --------------------------------------------------------------------------------

describe('correcting an inspection through the API', () => {
	it('supersedes the record, the state follows, and a stale version gets the 409 message', async () => {
		const joint = jointInRepair();
		const [rejected] = inspections.list(joint.id);
		expect(rejected.stage).toBe('visual');

		const stale = await call(postInspection, joint.id, inspectorId, {
			stage: 'visual',
			readings: WITHIN,
			decision: 'accept',
			reason: 'Re-gauged: undercut 1/32 in',
			supersedes: rejected.id,
			version: joint.version - 1
		});
		expect(stale.status).toBe(409);
		expect(stale.body).toMatchObject({ field: 'version' });
		expect(stale.body.error).toMatch(/Someone else changed joint .* Reload it/);

		const noReason = await call(postInspection, joint.id, inspectorId, {
			stage: 'visual',
			readings: WITHIN,
			decision: 'accept',
			supersedes: rejected.id,
			version: joint.version
		});
		expect(noReason.status).toBe(400);
		expect(noReason.body.field).toBe('reason');

		const corrected = await call(postInspection, joint.id, inspectorId, {
			stage: 'visual',
			readings: WITHIN,
			decision: 'accept',
			reason: 'Re-gauged in daylight: undercut 1/32 in, within',
			supersedes: rejected.id,
			version: joint.version
		});
		expect(corrected.status).toBe(201);
		expect(corrected.body.inspection).toMatchObject({
			supersedesId: rejected.id,
			verdict: 'within',
			againstVerdict: false
		});
		// RT is required of the joint, so an accepted visual leaves it waiting for NDE.
		expect(corrected.body.joint.state).toBe('awaiting_nde');
		expect(expectCacheAgrees(joint.id).state).toBe('awaiting_nde');
		const history = inspections.list(joint.id);
		expect(history.find((r) => r.id === rejected.id)!.supersededById).toBe(
			corrected.body.inspection.id
		);
		const readings = corrected.body.inspection.readings as { id: string; text: string }[];
		expect(readings.find((r) => r.id === 'undercutDepth')!.text).toBe('1/32');
	});
});
