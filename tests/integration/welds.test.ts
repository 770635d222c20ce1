/**
 * Recording welds: the module and POST/GET /api/joints/{id}/welds against a real SQLite file
 * with projects made by the test factory. Welder continuity is the six-month rule of ASME BPVC Section IX QW-322.1
 * and AWS D1.1:2020 6.2.3.1 (clause number unconfirmed; 4.1.3.1 in the 2006 edition), see
 * reference/standards.md §7.
 */
import { and, eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import * as joints from '$lib/server/joints';
import * as inspections from '$lib/server/inspections';
import * as welds from '$lib/server/welds';
import * as users from '$lib/server/users';
import { deriveJointState } from '$lib/joint-state';
import { recordInspectionSchema, recordWeldSchema } from '$lib/schemas/inspection';
import type { JointFields } from '$lib/schemas/joint';
import { GET, POST } from '../../src/routes/api/joints/[jointId=id]/welds/+server';
import { makeProject } from '../fixtures/projects';
import { qualifiedWelder } from '../fixtures/welders';
import { stampKey } from '$lib/domain';

type Handler = (event: never) => Response | Promise<Response>;

let inspectorId: string;
let foremanId: string;
let adminId: string;
let projectId: number;
let revisionId: number;
/** A welder's stamp on another project. */
let elsewhereStamp: string;
const foreman = () => users.principal(foremanId)!;
const admin = () => users.principal(adminId)!;

beforeAll(async () => {
	const job = await makeProject();
	({ inspector: inspectorId, foreman: foremanId, admin: adminId } = job.users);
	({ projectId, revisionId } = job.drawing);
	elsewhereStamp = qualifiedWelder((await makeProject({ units: 'metric' })).projectId, 'EL');
});

// Factories ----------------------------------------------------------------------------------

let placed = 0;
/** A butt joint with its fit-up accepted, ready to weld (3 in SCH 40, ASME B31.3 normal). */
function readyJoint(fields: Partial<JointFields> = {}) {
	placed++;
	const { joint } = joints.place(
		{
			revisionId,
			pageIndex: 0,
			x: 30 + placed * 3,
			y: 420,
			joint: {
				kind: 'butt',
				size: '3',
				thickness: '0.216 in',
				criteriaSetId: 'asme-b31.3-normal',
				wps: 'WPS-CS-01 GTAW/SMAW',
				...fields
			}
		},
		inspectorId
	);
	inspections.record(
		joint.id,
		recordInspectionSchema.parse({
			version: joints.row(joint.id)!.version,
			stage: 'fitup',
			readings: {},
			decision: 'accept'
		}),
		inspectorId
	);
	return joints.row(joint.id)!;
}

interface Qualification {
	process: string;
	qualifiedOn?: string;
	lastUsedOn?: string | null;
	expiresOn?: string | null;
}

let stamps = 0;
function newWelder(qualifications: Qualification[], status: 'active' | 'inactive' = 'active') {
	const stamp = `W${++stamps}`;
	const id = db
		.insert(schema.welders)
		.values({ projectId, stamp, stampKey: stampKey(stamp), name: `Welder ${stamp}`, status })
		.returning()
		.get().id;
	for (const q of qualifications) {
		db.insert(schema.welderQualifications)
			.values({
				welderId: id,
				process: q.process,
				qualifiedOn: q.qualifiedOn ?? '2024-01-08',
				lastUsedOn: q.lastUsedOn === undefined ? '2025-05-01' : q.lastUsedOn,
				expiresOn: q.expiresOn ?? null
			})
			.run();
	}
	return { id, stamp };
}

function lastUsed(welderId: number, process: string) {
	return db
		.select()
		.from(schema.welderQualifications)
		.where(
			and(
				eq(schema.welderQualifications.welderId, welderId),
				eq(schema.welderQualifications.process, process)
			)
		)
		.get()!.lastUsedOn;
}

const weld = (jointId: number, body: unknown, user = foreman()) =>
	welds.record(
		jointId,
		recordWeldSchema.parse({ version: joints.row(jointId)!.version, ...(body as object) }),
		user
	);

function expectCacheAgrees(jointId: number) {
	const cached = joints.row(jointId)!;
	const derived = deriveJointState(joints.stateInput(jointId)!);
	expect({ state: cached.state, repairCycle: cached.repairCycle }).toEqual(derived);
	return cached;
}

async function post(jointId: number, userId: string, body: unknown) {
	const response = await (POST as unknown as Handler)({
		params: { jointId: String(jointId) },
		request: new Request(`http://localhost/api/joints/${jointId}/welds`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			// As the weld form sends it: with the joint's version as last read, unless given.
			body: JSON.stringify({ version: joints.row(jointId)?.version, ...(body as object) })
		}),
		locals: { user: users.principal(userId) }
	} as never);
	return { status: response.status, body: await response.json() };
}

// Tests ----------------------------------------------------------------------------------------

describe('recording a weld', () => {
	it('answers 201 with the weld and the joint, writes a stamp per pass and moves last use', async () => {
		const root = newWelder([{ process: 'GTAW' }]);
		const fillCap = newWelder([{ process: 'SMAW' }]);
		const joint = readyJoint();
		const answer = await post(joint.id, foremanId, {
			weldedOn: '2025-06-10',
			welders: { root: root.stamp, fill: fillCap.stamp, cap: fillCap.stamp.toLowerCase() }
		});
		expect(answer.status).toBe(201);
		expect(answer.body.weld).toMatchObject({
			repairCycle: 0,
			weldedOn: '2025-06-10',
			wps: 'WPS-CS-01 GTAW/SMAW',
			process: 'GTAW/SMAW',
			overrideReason: null,
			recordedBy: foremanId
		});
		expect(answer.body.joint).toMatchObject({
			id: joint.id,
			state: 'awaiting_visual',
			repairCycle: 0,
			version: joint.version + 1
		});
		expectCacheAgrees(joint.id);
		const rows = db
			.select()
			.from(schema.weldWelders)
			.where(eq(schema.weldWelders.weldId, answer.body.weld.id))
			.all();
		expect(rows.map((r) => [r.pass, r.welderId]).sort()).toEqual([
			['cap', fillCap.id],
			['fill', fillCap.id],
			['root', root.id]
		]);
		expect(lastUsed(root.id, 'GTAW')).toBe('2025-06-10');
		expect(lastUsed(fillCap.id, 'SMAW')).toBe('2025-06-10');

		const listed = await (GET as unknown as Handler)({
			params: { jointId: String(joint.id) }
		} as never);
		const { welds: log } = await listed.json();
		expect(log).toHaveLength(1);
		expect(log[0].welders).toEqual([
			{ pass: 'root', welderId: root.id, stamp: root.stamp, name: `Welder ${root.stamp}` },
			{ pass: 'fill', welderId: fillCap.id, stamp: fillCap.stamp, name: `Welder ${fillCap.stamp}` },
			{ pass: 'cap', welderId: fillCap.id, stamp: fillCap.stamp, name: `Welder ${fillCap.stamp}` }
		]);
		expect(log[0].recordedByName).toBe(users.byId(foremanId)!.name);
	});

	it('moves last use forward only: an earlier weld date leaves it where it is', () => {
		const welder = newWelder([{ process: 'GTAW', lastUsedOn: '2025-05-20' }]);
		weld(readyJoint().id, {
			weldedOn: '2025-05-12',
			process: 'GTAW',
			welders: { root: welder.stamp }
		});
		expect(lastUsed(welder.id, 'GTAW')).toBe('2025-05-20');
		weld(readyJoint().id, {
			weldedOn: '2025-05-21',
			process: 'GTAW',
			welders: { root: welder.stamp }
		});
		expect(lastUsed(welder.id, 'GTAW')).toBe('2025-05-21');
	});

	it('makes a weld on a joint in repair the next repair cycle, and refuses other states', () => {
		const welder = newWelder([{ process: 'GTAW' }, { process: 'SMAW' }]);
		const stamps = { root: welder.stamp, fill: welder.stamp, cap: welder.stamp };
		const joint = readyJoint();
		weld(joint.id, { weldedOn: '2025-06-02', welders: stamps });
		expect(() => weld(joint.id, { weldedOn: '2025-06-03', welders: stamps })).toThrow(
			expect.objectContaining({
				status: 409,
				message: expect.stringMatching(/waits for its visual inspection/)
			})
		);
		inspections.record(
			joint.id,
			recordInspectionSchema.parse({
				version: joints.row(joint.id)!.version,
				stage: 'visual',
				// ASME B31.3-2018 Table 341.3.2 criterion H: Tw = 0.216 in → min(1/32, 0.054) = 1/32 in.
				readings: { undercutDepth: '1/16' },
				decision: 'reject'
			}),
			inspectorId
		);
		expect(expectCacheAgrees(joint.id).state).toBe('repair');
		expect(() => weld(joint.id, { weldedOn: '2025-06-01', welders: stamps })).toThrow(
			expect.objectContaining({ status: 400, field: 'weldedOn' })
		);
		const r1 = weld(joint.id, { weldedOn: '2025-06-04', welders: stamps });
		expect(r1.weld).toMatchObject({ repairCycle: 1, label: `${joint.number}-R1` });
		expect(r1.joint).toMatchObject({ state: 'awaiting_visual', repairCycle: 1 });
		expectCacheAgrees(joint.id);

		const { joint: unfitted } = joints.place(
			{ revisionId, pageIndex: 0, x: 9, y: 9, joint: { kind: 'butt' } },
			inspectorId
		);
		expect(() => weld(unfitted.id, { weldedOn: '2025-06-04', welders: stamps })).toThrow(
			expect.objectContaining({ status: 409, message: expect.stringMatching(/no accepted fit-up/) })
		);
		expect(() => weld(readyJoint().id, { weldedOn: '2999-01-01', welders: stamps })).toThrow(
			expect.objectContaining({ status: 400, field: 'weldedOn' })
		);
	});
});

describe('the process of each pass', () => {
	it('reads it from the WPS: root GTAW, fill and cap SMAW, and checks each pass against its own', () => {
		const gtawOnly = newWelder([{ process: 'GTAW' }]);
		const smawOnly = newWelder([{ process: 'SMAW' }]);
		expect(() =>
			weld(readyJoint().id, {
				weldedOn: '2025-06-02',
				welders: { root: smawOnly.stamp, fill: smawOnly.stamp }
			})
		).toThrow(
			expect.objectContaining({
				status: 409,
				field: 'welders.root',
				message: expect.stringContaining(`${smawOnly.stamp}`)
			})
		);
		expect(() =>
			weld(readyJoint().id, {
				weldedOn: '2025-06-02',
				welders: { root: gtawOnly.stamp, fill: gtawOnly.stamp }
			})
		).toThrow(
			expect.objectContaining({ field: 'welders.fill', message: expect.stringMatching(/no SMAW/) })
		);
		const made = weld(readyJoint().id, {
			weldedOn: '2025-06-02',
			welders: { root: gtawOnly.stamp, fill: smawOnly.stamp }
		});
		expect(made.weld.welders.map((s) => [s.pass, s.process])).toEqual([
			['root', 'GTAW'],
			['fill', 'SMAW']
		]);
	});

	it('takes the process given, and asks for it when the WPS names none', async () => {
		const gtawOnly = newWelder([{ process: 'GTAW' }]);
		const made = weld(readyJoint().id, {
			weldedOn: '2025-06-02',
			process: 'gtaw',
			welders: { root: gtawOnly.stamp, fill: gtawOnly.stamp, cap: gtawOnly.stamp }
		});
		expect(made.weld.process).toBe('GTAW');
		const blank = readyJoint({ wps: 'WPS-CS-07' });
		const answer = await post(blank.id, foremanId, {
			weldedOn: '2025-06-02',
			welders: { root: gtawOnly.stamp }
		});
		expect(answer.status).toBe(400);
		expect(answer.body.field).toBe('process');
		expect(answer.body.error).toMatch(/"WPS-CS-07" names no welding process/);
	});

	it('reads AWS letters and ISO 4063 numbers from a WPS designation', () => {
		expect(welds.processFromWps('WPS-CS-01 GTAW/SMAW')).toEqual({
			root: 'GTAW',
			fill: 'SMAW',
			cap: 'SMAW'
		});
		expect(welds.processFromWps('WPS-ST-04 FCAW')).toEqual({
			root: 'FCAW',
			fill: 'FCAW',
			cap: 'FCAW'
		});
		// ISO 4063: 141 = TIG (GTAW), 111 = manual metal arc (SMAW), 136 = flux-cored, active gas.
		expect(welds.processFromWps('WPS-VFT-02 141/111')).toEqual({
			root: 'GTAW',
			fill: 'SMAW',
			cap: 'SMAW'
		});
		expect(welds.processFromWps('WPS-VFT-07 136')?.root).toBe('FCAW');
		expect(welds.processFromWps('WPS-CS-01')).toBeNull();
		expect(welds.passProcesses('GTAW/SMAW/FCAW')).toEqual({
			root: 'GTAW',
			fill: 'SMAW',
			cap: 'FCAW'
		});
		expect(welds.passProcesses('GTAW/SMAW/FCAW/SAW')).toBeNull();
	});
});

describe('welder continuity: six months without the process (ASME IX QW-322.1; AWS D1.1:2020 6.2.3.1)', () => {
	// Calendar months from the last use: last used 2025-03-15 → valid through 2025-09-15.
	const lapsing = () => newWelder([{ process: 'GTAW', lastUsedOn: '2025-03-15' }]);
	const gtaw = (stamp: string, weldedOn: string) => ({
		weldedOn,
		process: 'GTAW',
		welders: { root: stamp }
	});

	it('lets the welder weld the day before six months are up', () => {
		const welder = lapsing();
		expect(weld(readyJoint().id, gtaw(welder.stamp, '2025-09-14')).weld.overrideReason).toBeNull();
	});

	it('lets the welder weld exactly six months after the last use', () => {
		const welder = lapsing();
		expect(weld(readyJoint().id, gtaw(welder.stamp, '2025-09-15')).weld.repairCycle).toBe(0);
		expect(lastUsed(welder.id, 'GTAW')).toBe('2025-09-15');
	});

	it('refuses the day after with 409, naming the welder, the process and the date it lapsed', async () => {
		const welder = lapsing();
		const joint = readyJoint();
		const answer = await post(joint.id, foremanId, gtaw(welder.stamp, '2025-09-16'));
		expect(answer.status).toBe(409);
		expect(answer.body.field).toBe('welders.root');
		expect(answer.body.error).toContain(`Welder ${welder.stamp} (Welder ${welder.stamp})`);
		expect(answer.body.error).toContain('GTAW qualification lapsed on 2025-09-16');
		expect(answer.body.error).toContain('last use on 2025-03-15');
		expect(answer.body.error).toContain('QW-322.1');
		expect(answer.body.error).toMatch(/ask an administrator/);
		expect(expectCacheAgrees(joint.id).state).toBe('ready_to_weld');
		expect(lastUsed(welder.id, 'GTAW')).toBe('2025-03-15');
	});

	it('counts calendar months, falling back to the last day of a shorter month', () => {
		expect(welds.continuityValidThrough('2026-03-15')).toBe('2026-09-15');
		expect(welds.continuityValidThrough('2026-08-31')).toBe('2027-02-28');
		expect(welds.continuityValidThrough('2027-08-31')).toBe('2028-02-29');
		expect(welds.continuityValidThrough('2026-12-01')).toBe('2027-06-01');
		const record = { process: 'GTAW', qualifiedOn: '2026-01-05', expiresOn: null };
		expect(welds.checkQualification({ ...record, lastUsedOn: null }, '2026-07-05').ok).toBe(true);
		expect(welds.checkQualification({ ...record, lastUsedOn: null }, '2026-07-06')).toMatchObject({
			problem: 'lapsed',
			lapsedOn: '2026-07-06'
		});
	});
});

describe('welders refused', () => {
	it('refuses an expired qualification after its expiry date, not on it', () => {
		const welder = newWelder([
			{ process: 'GTAW', lastUsedOn: '2025-06-01', expiresOn: '2025-06-30' }
		]);
		expect(() =>
			weld(readyJoint().id, {
				weldedOn: '2025-07-01',
				process: 'GTAW',
				welders: { root: welder.stamp }
			})
		).toThrow(
			expect.objectContaining({
				status: 409,
				message: expect.stringContaining('GTAW qualification expired after 2025-06-30')
			})
		);
		const onTheDay = weld(readyJoint().id, {
			weldedOn: '2025-06-30',
			process: 'GTAW',
			welders: { root: welder.stamp }
		});
		expect(onTheDay.weld.weldedOn).toBe('2025-06-30');
	});

	it('refuses an inactive welder with 409 and an unknown stamp with 400 naming the pass', async () => {
		const inactive = newWelder([{ process: 'GTAW' }, { process: 'SMAW' }], 'inactive');
		const active = newWelder([{ process: 'GTAW' }, { process: 'SMAW' }]);
		const joint = readyJoint();
		const gone = await post(joint.id, foremanId, {
			weldedOn: '2025-06-02',
			welders: { root: active.stamp, fill: inactive.stamp }
		});
		expect(gone.status).toBe(409);
		expect(gone.body).toMatchObject({ field: 'welders.fill' });
		expect(gone.body.error).toMatch(/is inactive/);
		const unknown = await post(joint.id, foremanId, {
			weldedOn: '2025-06-02',
			welders: { root: active.stamp, cap: 'ZZ99' }
		});
		expect(unknown.status).toBe(400);
		expect(unknown.body).toMatchObject({ field: 'welders.cap' });
		expect(unknown.body.error).toMatch(/No welder with stamp ZZ99/);
		// A stamp of another project is as unknown as a made-up one.
		const foreign = await post(joint.id, foremanId, {
			weldedOn: '2025-06-02',
			welders: { root: elsewhereStamp }
		});
		expect(foreign).toMatchObject({ status: 400, body: { field: 'welders.root' } });
		expect(expectCacheAgrees(joint.id).state).toBe('ready_to_weld');
	});
});

describe('an administrator override', () => {
	it('lets an admin record a lapsed welder with a reason, stored and audited, without renewing', async () => {
		const welder = newWelder([{ process: 'GTAW', lastUsedOn: '2024-10-01' }]);
		const joint = readyJoint();
		const body = {
			weldedOn: '2025-06-02',
			process: 'GTAW',
			welders: { root: welder.stamp },
			override: {
				reason: 'Continuity log on paper shows GTAW use on 2025-02-11; log being corrected.'
			}
		};
		const byForeman = await post(joint.id, foremanId, body);
		expect(byForeman.status).toBe(403);
		expect(byForeman.body.field).toBe('override');
		const { override: _override, ...plain } = body;
		const withoutReason = await post(joint.id, adminId, plain);
		expect(withoutReason.status).toBe(409);
		expect(withoutReason.body.error).toMatch(/record the weld with an override reason/);

		const overridden = await post(joint.id, adminId, body);
		expect(overridden.status).toBe(201);
		expect(overridden.body.weld.overrideReason).toBe(body.override.reason);
		expect(expectCacheAgrees(joint.id).state).toBe('awaiting_visual');
		// Welding on a lapsed qualification does not renew it: QW-322.2 asks for a test.
		expect(lastUsed(welder.id, 'GTAW')).toBe('2024-10-01');
		const audited = joints.detail(joint.id)!.changes.at(-1)!;
		expect(audited).toMatchObject({
			action: 'weld',
			by: users.byId(adminId)!.name,
			after: {
				override: {
					reason: body.override.reason,
					refused: [expect.stringContaining('lapsed on 2025-04-02')]
				}
			}
		});
	});

	it('does not override what is not a date: no qualification for the process', () => {
		const welder = newWelder([{ process: 'SMAW' }]);
		expect(() =>
			weld(
				readyJoint().id,
				{
					weldedOn: '2025-06-02',
					process: 'GTAW',
					welders: { root: welder.stamp },
					override: { reason: 'Urgent tie-in.' }
				},
				admin()
			)
		).toThrow(expect.objectContaining({ status: 409, message: expect.stringMatching(/no GTAW/) }));
	});
});
