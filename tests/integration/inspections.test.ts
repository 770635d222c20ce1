/**
 * Recording inspections: the module and POST/GET /api/joints/{id}/inspections against a real
 * SQLite file with a project made by the test factory. Limits are ASME B31.3-2018 normal fluid service, as the
 * engine's set gives them (reference/standards.md §2).
 */
import { eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import * as joints from '$lib/server/joints';
import * as inspections from '$lib/server/inspections';
import * as events from '$lib/server/events';
import * as users from '$lib/server/users';
import { ruleFor } from '$lib/server/route-access';
import { can } from '$lib/permissions';
import { deriveJointState } from '$lib/joint-state';
import { recordInspectionSchema } from '$lib/schemas/inspection';
import type { JointFields } from '$lib/schemas/joint';
import {
	GET as listInspections,
	POST as postInspection
} from '../../src/routes/api/joints/[jointId=id]/inspections/+server';
import {
	GET as listWelds,
	POST as postWeld
} from '../../src/routes/api/joints/[jointId=id]/welds/+server';
import { makeProject } from '../fixtures/projects';
import { qualifiedWelder, weldJoint } from '../fixtures/welders';
import { CLEAN, FITUP, OUTSIDE, WITHIN } from '../fixtures/readings';

type Handler = (event: never) => Response | Promise<Response>;

let inspectorId: string;
let foremanId: string;
let projectId: number;
let revisionId: number;

beforeAll(async () => {
	const job = await makeProject();
	({ inspector: inspectorId, foreman: foremanId } = job.users);
	({ projectId, revisionId } = job.drawing);
});

// Factories ----------------------------------------------------------------------------------

let placed = 0;
/** A new butt joint on an inch project: 6 in SCH 40, Tw = 0.280 in, ASME B31.3 normal. */
function newJoint(fields: Partial<JointFields> = {}) {
	placed++;
	return joints.place(
		{
			revisionId,
			pageIndex: 0,
			x: 40 + placed * 3,
			y: 500,
			joint: {
				kind: 'butt',
				size: '6',
				thickness: '0.280 in',
				criteriaSetId: 'asme-b31.3-normal',
				wps: 'WPS-CS-01 GTAW/SMAW',
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

/** The cached state column says what the records say. */
function expectCacheAgrees(jointId: number) {
	const cached = joints.row(jointId)!;
	const derived = deriveJointState(joints.stateInput(jointId)!);
	expect({ state: cached.state, repairCycle: cached.repairCycle }).toEqual(derived);
	return cached;
}

// Just past ASME B31.3-2018 Table 341.3.2 criterion H's 1/32 in (0.79375 mm) on Tw = 0.280 in.
const JUST_OUTSIDE = { ...CLEAN, undercutDepth: '0.032 in' };

function request(path: string, method: 'GET' | 'POST', body?: unknown) {
	return new Request(`http://localhost${path}`, {
		method,
		headers: { 'content-type': 'application/json' },
		body: body === undefined ? undefined : JSON.stringify(body)
	});
}

/** The body as the joint card sends it: with the joint's version as last read, unless given. */
function withVersion(jointId: number, body: unknown) {
	return body === undefined
		? undefined
		: { version: joints.row(jointId)?.version, ...(body as object) };
}

async function call(handler: unknown, jointId: number, userId: string, body?: unknown) {
	const method = body === undefined ? 'GET' : 'POST';
	const response = await (handler as Handler)({
		params: { jointId: String(jointId) },
		request: request(`/api/joints/${jointId}`, method, withVersion(jointId, body)),
		locals: { user: users.principal(userId) }
	} as never);
	return { status: response.status, body: await response.json() };
}

// Tests ----------------------------------------------------------------------------------------

describe('a joint from fit-up to acceptance, through the API', () => {
	it('fit-up, weld, visual reject, repair R1, visual accept, RT accept: accepted', async () => {
		const joint = newJoint({ ndeRequired: 'RT' });
		const seen: { action: string; jointId: number }[] = [];
		const unsubscribe = events.subscribe(projectId, (e) => {
			if (e.type === 'joint') seen.push(e);
		});
		let version = joint.version;
		const step = (answer: { status: number; body: { joint: { version: number } } }) => {
			expect(answer.status).toBe(201);
			expect(answer.body.joint.version).toBe(++version);
			return expectCacheAgrees(joint.id);
		};

		const fitup = await call(postInspection, joint.id, inspectorId, {
			stage: 'fitup',
			readings: FITUP,
			decision: 'accept'
		});
		// B31.3 328.4.2 / 328.4.3 leave bevel, gap and hi-lo to the WPS: the engine says judge.
		expect(fitup.body.inspection).toMatchObject({
			stage: 'fitup',
			verdict: 'judge',
			criteriaSetId: 'asme-b31.3-normal',
			criteriaSetVersion: 1,
			inspectorId,
			repairCycle: 0,
			againstVerdict: false
		});
		expect(fitup.body.inspection.readings).toContainEqual({
			id: 'bevelAngle',
			text: '37-1/2°',
			value: 37.5,
			unit: 'deg'
		});
		expect(fitup.body.joint).toMatchObject({ state: 'ready_to_weld', stateLabel: 'Ready to weld' });
		expect(step(fitup).state).toBe('ready_to_weld');

		const root = qualifiedWelder(projectId);
		const fill = qualifiedWelder(projectId);
		const first = await call(postWeld, joint.id, foremanId, {
			weldedOn: '2025-06-02',
			welders: { root, fill, cap: fill }
		});
		expect(first.body.weld).toMatchObject({ repairCycle: 0, process: 'GTAW/SMAW' });
		expect(step(first).state).toBe('awaiting_visual');

		const rejected = await call(postInspection, joint.id, inspectorId, {
			stage: 'visual',
			readings: OUTSIDE,
			decision: 'reject'
		});
		expect(rejected.body.inspection).toMatchObject({ verdict: 'outside', againstVerdict: false });
		const undercut = rejected.body.inspection.findings.find(
			(f: { check: string }) => f.check === 'undercut.depth'
		);
		expect(undercut).toMatchObject({
			outcome: 'outside',
			clause: 'Table 341.3.2, undercut, criterion H'
		});
		expect(undercut.limit).toBeCloseTo(25.4 / 32, 6);
		expect(step(rejected)).toMatchObject({ state: 'repair', repairCycle: 0 });

		const repairWeld = await call(postWeld, joint.id, foremanId, {
			weldedOn: '2025-06-04',
			welders: { root, fill, cap: fill }
		});
		expect(repairWeld.body.weld).toMatchObject({ repairCycle: 1, label: `${joint.number}-R1` });
		expect(step(repairWeld)).toMatchObject({ state: 'awaiting_visual', repairCycle: 1 });

		const accepted = await call(postInspection, joint.id, inspectorId, {
			stage: 'visual',
			readings: WITHIN,
			decision: 'accept'
		});
		expect(accepted.body.inspection).toMatchObject({ verdict: 'within', repairCycle: 1 });
		expect(step(accepted).state).toBe('awaiting_nde');

		const rt = await call(postInspection, joint.id, inspectorId, {
			stage: 'nde',
			method: 'RT',
			decision: 'accept',
			reportNo: 'RT-1105-0042-R1',
			technician: 'K. Averill (Level II)'
		});
		expect(rt.body.inspection).toMatchObject({
			method: 'RT',
			verdict: null,
			repairCycle: 1,
			reportNo: 'RT-1105-0042-R1'
		});
		expect(step(rt)).toMatchObject({ state: 'accepted', repairCycle: 1 });
		unsubscribe();

		expect(seen.filter((e) => e.jointId === joint.id).map((e) => e.action)).toEqual(
			Array(6).fill('recorded')
		);
		const history = await call(listInspections, joint.id, inspectorId);
		expect(history.status).toBe(200);
		expect(
			history.body.inspections.map((r: { stage: string; decision: string }) => [
				r.stage,
				r.decision
			])
		).toEqual([
			['nde', 'accept'],
			['visual', 'accept'],
			['visual', 'reject'],
			['fitup', 'accept']
		]);
		expect(history.body.inspections[0].inspector).toBe(users.byId(inspectorId)!.name);
		const weldLog = await call(listWelds, joint.id, foremanId);
		expect(weldLog.body.welds.map((w: { label: string }) => w.label)).toEqual([
			joint.number,
			`${joint.number}-R1`
		]);
		expect(weldLog.body.welds[1].welders.map((s: { pass: string; stamp: string }) => s)).toEqual([
			expect.objectContaining({ pass: 'root', stamp: root }),
			expect.objectContaining({ pass: 'fill', stamp: fill }),
			expect.objectContaining({ pass: 'cap', stamp: fill })
		]);
		const audited = joints.detail(joint.id)!.changes.map((c) => c.action);
		expect(audited).toEqual([
			'create',
			'inspection',
			'weld',
			'inspection',
			'weld',
			'inspection',
			'inspection'
		]);
	});

	it('a rejected fit-up leaves the joint fitup_rejected, and a new fit-up after re-fitting counts', () => {
		const joint = newJoint();
		const rejected = inspect(joint.id, {
			stage: 'fitup',
			readings: { ...FITUP, rootOpening: '3/16' },
			decision: 'reject'
		});
		expect(rejected.joint.state).toBe('fitup_rejected');
		expect(expectCacheAgrees(joint.id).state).toBe('fitup_rejected');
		const again = inspect(joint.id, { stage: 'fitup', readings: FITUP, decision: 'accept' });
		expect(again.joint.state).toBe('ready_to_weld');
		expectCacheAgrees(joint.id);
	});
});

describe('the verdict is the server own, and a decision against it needs a reason', () => {
	function weldedJoint() {
		const joint = newJoint();
		inspect(joint.id, { stage: 'fitup', readings: FITUP, decision: 'accept' });
		weldJoint(projectId, joint.id, foremanId);
		return joint;
	}

	it('refuses an accept of readings outside the limit without a reason (400), flags it with one', async () => {
		const joint = weldedJoint();
		const refused = await call(postInspection, joint.id, inspectorId, {
			stage: 'visual',
			readings: JUST_OUTSIDE,
			decision: 'accept'
		});
		expect(refused.status).toBe(400);
		expect(refused.body).toMatchObject({ field: 'reason' });
		expect(refused.body.error).toMatch(/outside the limits of ASME B31\.3 2018/);
		expect(inspections.list(joint.id).filter((r) => r.stage === 'visual')).toEqual([]);

		const flagged = await call(postInspection, joint.id, inspectorId, {
			stage: 'visual',
			readings: JUST_OUTSIDE,
			decision: 'accept',
			reason: 'Undercut blended out and re-gauged at 1/32 in; owner QA witnessed.',
			// A client's own verdict is not part of the input and is never stored.
			verdict: 'within'
		});
		expect(flagged.status).toBe(201);
		expect(flagged.body.inspection).toMatchObject({
			verdict: 'outside',
			decision: 'accept',
			againstVerdict: true,
			reason: 'Undercut blended out and re-gauged at 1/32 in; owner QA witnessed.'
		});
		// Not selected in its RT 5 % lot: it waits on the lot's sample (ASME B31.3-2018 341.4.1(b)(1)).
		expect(expectCacheAgrees(joint.id).state).toBe('awaiting_lot');
	});

	it('refuses a reject of readings within the limit without a reason, flags it with one', () => {
		const joint = weldedJoint();
		expect(() =>
			inspect(joint.id, { stage: 'visual', readings: WITHIN, decision: 'reject' })
		).toThrow(expect.objectContaining({ status: 400, field: 'reason' }));
		const flagged = inspect(joint.id, {
			stage: 'visual',
			readings: WITHIN,
			decision: 'reject',
			reason: 'Arc strike beside the cap; not a reading, but the owner spec rejects it.'
		});
		expect(flagged.inspection).toMatchObject({ verdict: 'within', againstVerdict: true });
		expect(flagged.joint.state).toBe('repair');
		expectCacheAgrees(joint.id);
	});

	it('needs no reason where the engine leaves it to the inspector (judge)', () => {
		const joint = weldedJoint();
		// No porosity reading: the engine cannot settle the verdict.
		const { porosity: _porosity, ...withoutPorosity } = WITHIN;
		const accepted = inspect(joint.id, {
			stage: 'visual',
			readings: withoutPorosity,
			decision: 'accept'
		});
		expect(accepted.inspection).toMatchObject({ verdict: 'judge', againstVerdict: false });
		expect(accepted.joint.state).toBe('awaiting_lot');
	});

	// ASME B31.3-2018 Table 341.3.2 criterion B (normal, girth): incomplete penetration at most
	// 1/32 in and 0.2Tw deep, at most 1.5 in in any 6 in; criterion L for internal protrusion.
	it('judges and stores the root-side readings, a pore count and a roughness as typed', () => {
		const joint = weldedJoint();
		const recorded = inspect(joint.id, {
			stage: 'visual',
			readings: {
				...WITHIN,
				incompletePenetrationLength: '1 in',
				incompletePenetrationDepth: '1/32',
				rootProtrusion: '1/8',
				poreCount: '0',
				surfaceRoughness: '250 µin'
			},
			decision: 'accept'
		});
		expect(recorded.inspection.verdict).toBe('within');
		const checks = recorded.inspection.findings.map((f) => f.check);
		expect(checks).toEqual(
			expect.arrayContaining(['penetration.length', 'penetration.depth', 'rootProtrusion.max'])
		);
		const stored = Object.fromEntries(recorded.inspection.readings.map((r) => [r.id, r]));
		expect(stored.incompletePenetrationLength).toMatchObject({
			text: '1 in',
			value: 25.4,
			unit: 'mm'
		});
		expect(stored.poreCount).toEqual({ id: 'poreCount', text: '0', value: 0, unit: 'count' });
		expect(stored.surfaceRoughness).toMatchObject({ text: '250 µin', unit: 'um' });
		expect(stored.surfaceRoughness.value).toBeCloseTo(6.35, 9);
	});

	it('is outside for incomplete penetration deeper than criterion B allows', () => {
		const joint = weldedJoint();
		expect(() =>
			inspect(joint.id, {
				stage: 'visual',
				readings: {
					...WITHIN,
					incompletePenetrationLength: '1',
					incompletePenetrationDepth: '3/64'
				},
				decision: 'accept'
			})
		).toThrow(expect.objectContaining({ status: 400, field: 'reason' }));
	});

	it('answers 400 naming the field for a reading it cannot read or does not know', async () => {
		const joint = weldedJoint();
		const unreadable = await call(postInspection, joint.id, inspectorId, {
			stage: 'visual',
			readings: { ...WITHIN, undercutDepth: 'a hair' },
			decision: 'accept'
		});
		expect(unreadable.status).toBe(400);
		expect(unreadable.body.field).toBe('readings.undercutDepth');
		expect(unreadable.body.error).toMatch(/Undercut depth: cannot read "a hair"/);
		const unknown = await call(postInspection, joint.id, inspectorId, {
			stage: 'visual',
			readings: { undercut: '1/32' },
			decision: 'accept'
		});
		expect(unknown.status).toBe(400);
		expect(unknown.body.field).toBe('readings.undercut');
		const count = await call(postInspection, joint.id, inspectorId, {
			stage: 'visual',
			readings: { ...WITHIN, poreCount: 'a few' },
			decision: 'accept'
		});
		expect(count).toMatchObject({ status: 400, body: { field: 'readings.poreCount' } });
		const noMethod = await call(postInspection, joint.id, inspectorId, {
			stage: 'nde',
			decision: 'accept'
		});
		expect(noMethod).toMatchObject({ status: 400, body: { field: 'method' } });
		expect(expectCacheAgrees(joint.id).state).toBe('awaiting_visual');
	});

	it('keeps a reading sent as a number of millimetres with its unit in the text', () => {
		const joint = weldedJoint();
		const { inspection } = inspect(joint.id, {
			stage: 'visual',
			readings: { ...WITHIN, undercutDepth: 0.5 },
			decision: 'accept'
		});
		expect(inspection.readings).toContainEqual({
			id: 'undercutDepth',
			text: '0.5 mm',
			value: 0.5,
			unit: 'mm'
		});
		expect(inspection.readings).toContainEqual({
			id: 'crack',
			text: 'no',
			value: false,
			unit: 'bool'
		});
	});
});

describe('corrections are new rows that supersede', () => {
	it('replaces a visual result, keeps both in the history, and refuses a second correction of it', () => {
		const joint = newJoint();
		inspect(joint.id, { stage: 'fitup', readings: FITUP, decision: 'accept' });
		weldJoint(projectId, joint.id, foremanId);
		const original = inspect(joint.id, { stage: 'visual', readings: WITHIN, decision: 'accept' });
		expect(original.joint.state).toBe('awaiting_lot');

		// A second result without naming the one it replaces is refused, not taken as the last word.
		expect(() =>
			inspect(joint.id, { stage: 'visual', readings: OUTSIDE, decision: 'reject' })
		).toThrow(
			expect.objectContaining({ status: 409, message: expect.stringMatching(/correction/) })
		);

		// A correction says why; without a reason nothing is stored.
		expect(() =>
			inspect(joint.id, {
				stage: 'visual',
				readings: OUTSIDE,
				decision: 'reject',
				supersedes: original.inspection.id
			})
		).toThrow(expect.objectContaining({ status: 400, field: 'reason' }));
		expect(inspections.list(joint.id)).toHaveLength(2);

		const correction = inspect(joint.id, {
			stage: 'visual',
			readings: OUTSIDE,
			decision: 'reject',
			reason: 'Re-gauged in daylight: undercut is 1/16 in, not 1/32 in',
			supersedes: original.inspection.id
		});
		expect(correction.inspection.supersedesId).toBe(original.inspection.id);
		expect(correction.joint.state).toBe('repair');
		expectCacheAgrees(joint.id);

		const history = inspections.list(joint.id);
		expect(history.map((r) => [r.id, r.supersedesId, r.supersededById])).toEqual([
			[correction.inspection.id, original.inspection.id, null],
			[original.inspection.id, null, correction.inspection.id],
			[expect.any(Number), null, null]
		]);
		const stored = db
			.select()
			.from(schema.inspections)
			.where(eq(schema.inspections.id, original.inspection.id))
			.get()!;
		expect(stored.decision).toBe('accept');

		expect(() =>
			inspect(joint.id, {
				stage: 'visual',
				readings: WITHIN,
				decision: 'accept',
				supersedes: original.inspection.id
			})
		).toThrow(
			expect.objectContaining({
				status: 409,
				field: 'supersedes',
				message: expect.stringContaining(`corrected by record ${correction.inspection.id}`)
			})
		);
		expect(() =>
			inspect(joint.id, {
				stage: 'fitup',
				readings: FITUP,
				decision: 'accept',
				supersedes: correction.inspection.id
			})
		).toThrow(expect.objectContaining({ status: 400, field: 'supersedes' }));
		const other = newJoint();
		expect(() =>
			inspect(other.id, {
				stage: 'fitup',
				decision: 'accept',
				supersedes: correction.inspection.id
			})
		).toThrow(expect.objectContaining({ status: 400, field: 'supersedes' }));
		expect(joints.detail(joint.id)!.changes.at(-1)).toMatchObject({
			action: 'inspection_correct',
			after: { supersedes: original.inspection.id, state: 'repair' }
		});
	});
});

describe('stage order', () => {
	it('answers 409 with what to do next for each step out of order', async () => {
		const joint = newJoint({ ndeRequired: 'RT' });
		const refuse = async (body: unknown, message: RegExp) => {
			const answer = await call(postInspection, joint.id, inspectorId, body);
			expect(answer.status).toBe(409);
			expect(answer.body.error).toMatch(message);
			expectCacheAgrees(joint.id);
		};
		await refuse(
			{ stage: 'visual', readings: WITHIN, decision: 'accept' },
			/has not been welded yet: its fit-up must be accepted/
		);
		inspect(joint.id, { stage: 'fitup', readings: FITUP, decision: 'accept' });
		await refuse(
			{ stage: 'nde', method: 'RT', decision: 'accept' },
			/has not been welded yet: the foreman records the weld/
		);
		weldJoint(projectId, joint.id, foremanId);
		await refuse(
			{ stage: 'fitup', readings: FITUP, decision: 'accept' },
			/already welded .*fit-up is inspected before welding/
		);
		await refuse(
			{ stage: 'nde', method: 'RT', decision: 'accept' },
			/no accepted visual inspection yet/
		);
		inspect(joint.id, { stage: 'visual', readings: OUTSIDE, decision: 'reject' });
		await refuse(
			{ stage: 'nde', method: 'RT', decision: 'accept' },
			/was rejected .*repaired before any NDE/
		);
		await refuse(
			{ stage: 'visual', readings: WITHIN, decision: 'accept' },
			new RegExp(`repair weld \\(${joint.number}-R1\\) comes next`)
		);
		weldJoint(projectId, joint.id, foremanId, '2025-06-05');
		inspect(joint.id, { stage: 'visual', readings: WITHIN, decision: 'accept' });
		await refuse({ stage: 'nde', method: 'UT', decision: 'accept' }, /UT is not asked of joint/);
		const rt = inspect(joint.id, { stage: 'nde', method: 'RT', decision: 'accept' });
		expect(rt.inspection.repairCycle).toBe(1);
		await refuse(
			{ stage: 'nde', method: 'RT', decision: 'reject' },
			/already has a RT result .*correction/
		);

		const stale = inspections.record(
			joint.id,
			recordInspectionSchema.parse({
				stage: 'nde',
				method: 'RT',
				decision: 'accept',
				reason: 'Report RT-1105-07 re-read: film density checked',
				supersedes: rt.inspection.id,
				version: rt.joint.version
			}),
			inspectorId
		);
		expect(() =>
			inspect(joint.id, {
				stage: 'nde',
				method: 'RT',
				decision: 'reject',
				reason: 'Second reading of the film',
				supersedes: stale.inspection.id,
				version: rt.joint.version
			})
		).toThrow(expect.objectContaining({ status: 409, field: 'version' }));
	});

	it('records nothing on a void joint', async () => {
		const joint = newJoint();
		joints.voidJoint(joint.id, 'Deleted by field change FCR-31', joint.version, inspectorId);
		const answer = await call(postInspection, joint.id, inspectorId, {
			stage: 'fitup',
			readings: FITUP,
			decision: 'accept'
		});
		expect(answer.status).toBe(409);
		expect(answer.body.error).toMatch(/is void/);
		expect(expectCacheAgrees(joint.id).state).toBe('void');
	});

	it('lets only an inspector sign: the route table asks inspection.record', () => {
		const rule = ruleFor('/api/joints/[jointId=id]/inspections', 'POST', '');
		expect(rule).toEqual({ access: 'project', action: 'inspection.record' });
		const foreman = users.principal(foremanId)!;
		const inspector = users.principal(inspectorId)!;
		expect(can(foreman, 'inspection.record', projectId)).toBe(false);
		expect(can(inspector, 'inspection.record', projectId)).toBe(true);
		expect(ruleFor('/api/joints/[jointId=id]/inspections', 'GET', '')).toEqual({
			access: 'project',
			action: 'project.read'
		});
	});
});
