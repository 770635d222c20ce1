/**
 * The welder register: GET/POST /api/projects/{id}/welders and the module, against a real
 * SQLite file with a project made by the test factory. Continuity is the six-month rule of ASME BPVC Section IX
 * QW-322.1 and AWS D1.1:2020 6.2.3.1 (clause number unconfirmed; 4.1.3.1 in the 2006
 * edition), reference/standards.md §7; the register reuses welds.ts's rule for it.
 */
import { eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import * as joints from '$lib/server/joints';
import * as inspections from '$lib/server/inspections';
import * as welders from '$lib/server/welders';
import * as welds from '$lib/server/welds';
import * as users from '$lib/server/users';
import { recordInspectionSchema, recordWeldSchema } from '$lib/schemas/inspection';
import { GET, POST } from '../../src/routes/api/projects/[projectId=id]/welders/+server';
import { makeProject } from '../fixtures/projects';

type Handler = (event: never) => Response | Promise<Response>;

let projectId: number;
let revisionId: number;
let inspectorId: string;
let foremanId: string;

beforeAll(async () => {
	const job = await makeProject();
	({ inspector: inspectorId, foreman: foremanId } = job.users);
	({ projectId, revisionId } = job.drawing);
});

async function post(body: unknown) {
	const response = await (POST as unknown as Handler)({
		request: new Request(`http://localhost/api/projects/${projectId}/welders`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify(body)
		}),
		locals: { user: users.principal(foremanId)!, projectId }
	} as never);
	return { status: response.status, body: await response.json() };
}

describe('adding a welder', () => {
	it('answers 201 with the welder and its processes, and 409 for a stamp already used', async () => {
		const created = await post({
			stamp: 'K77',
			name: 'Kit Arrowsmith',
			employer: 'Brightwater Piping & Steel',
			processes: [{ process: 'smaw', qualifiedOn: '2026-01-05', reference: 'WPQ-K77-01' }]
		});
		expect(created.status).toBe(201);
		expect(created.body.welder).toMatchObject({
			stamp: 'K77',
			status: 'active',
			processes: [{ process: 'SMAW', qualifiedOn: '2026-01-05', lastUsedOn: null }],
			welds: { made: 0, examined: 0, rejected: 0, repairRate: null }
		});
		// Stamps are read without regard to case when welds are recorded, so k77 is K77.
		for (const stamp of ['K77', 'k77']) {
			const duplicate = await post({ stamp, name: 'Someone else' });
			expect(duplicate.status).toBe(409);
			expect(duplicate.body.field).toBe('stamp');
			expect(duplicate.body.error).toContain('Kit Arrowsmith');
		}
		const bad = await post({ stamp: '', name: 'No stamp' });
		expect(bad.status).toBe(400);
	});

	it('keeps the GET shape { items } and adds the lapsing list', async () => {
		const response = await (GET as unknown as Handler)({
			locals: { user: users.principal(foremanId)!, projectId }
		} as never);
		const body = await response.json();
		expect(Array.isArray(body.items)).toBe(true);
		expect(body.items[0]).toHaveProperty('stamp');
		expect(body.items[0]).toHaveProperty('processes');
		expect(Array.isArray(body.lapsing)).toBe(true);
		expect(body.warningDays).toBe(30);
	});
});

describe('qualifications lapsing within 30 days', () => {
	// Six calendar months from the last use is the last valid day (QW-322.1; D1.1 6.2.3.1).
	const today = '2026-06-01';
	const cases = [
		{ stamp: 'L-LAPSED', lastUsedOn: '2025-11-30', validThrough: '2026-05-30', listed: false },
		{ stamp: 'L-TODAY', lastUsedOn: '2025-12-01', validThrough: '2026-06-01', listed: true },
		{ stamp: 'L-30', lastUsedOn: '2026-01-01', validThrough: '2026-07-01', listed: true },
		{ stamp: 'L-31', lastUsedOn: '2026-01-02', validThrough: '2026-07-02', listed: false }
	];

	it('lists those valid today that lapse on or before today + 30 days, and no others', () => {
		for (const c of cases) {
			const welder = welders.create(
				projectId,
				{
					stamp: c.stamp,
					name: `Welder ${c.stamp}`,
					employer: '',
					processes: [{ process: 'GTAW', qualifiedOn: '2025-01-06', reference: '' }]
				},
				foremanId
			);
			db.update(schema.welderQualifications)
				.set({ lastUsedOn: c.lastUsedOn })
				.where(eq(schema.welderQualifications.welderId, welder.id))
				.run();
		}
		const register = welders.register(projectId, { today });
		for (const c of cases) {
			const row = register.items.find((w) => w.stamp === c.stamp)!;
			expect(row.processes[0].validThrough, c.stamp).toBe(c.validThrough);
			expect(row.processes[0].current, c.stamp).toBe(c.stamp !== 'L-LAPSED');
			expect(
				register.lapsing.some((q) => q.stamp === c.stamp),
				c.stamp
			).toBe(c.listed);
		}
		// The same dates through welds.ts's own check: lapsed the day after validThrough.
		expect(
			welds.checkQualification(
				{ process: 'GTAW', qualifiedOn: '2025-01-06', expiresOn: null, lastUsedOn: '2026-01-01' },
				'2026-07-02'
			)
		).toMatchObject({ ok: false, problem: 'lapsed' });
		const listed = register.lapsing.filter((q) => q.stamp.startsWith('L-')).map((q) => q.stamp);
		expect(listed).toEqual(['L-TODAY', 'L-30']);
	});

	it('leaves an inactive welder off the list', () => {
		const row = welders.list(projectId, { today }).find((w) => w.stamp === 'L-30')!;
		welders.setStatus(projectId, row.id, 'inactive', foremanId);
		expect(welders.lapsing(projectId, { today }).some((q) => q.stamp === 'L-30')).toBe(false);
		welders.setStatus(projectId, row.id, 'active', foremanId);
	});

	it('renews a process with a new test date (QW-322.2)', () => {
		const row = welders.list(projectId, { today }).find((w) => w.stamp === 'L-LAPSED')!;
		welders.qualify(
			projectId,
			row.id,
			{ process: 'GTAW', qualifiedOn: '2026-05-31', reference: 'WPQ-renewal' },
			foremanId
		);
		const renewed = welders.list(projectId, { today }).find((w) => w.stamp === 'L-LAPSED')!;
		expect(renewed.processes[0]).toMatchObject({ current: true, validThrough: '2026-11-30' });
	});
});

describe("a welder's record", () => {
	it('counts welds made, examined and rejected by NDE, and the repair rate on a joint basis', () => {
		welders.create(
			projectId,
			{
				stamp: 'RR1',
				name: 'Rate welder',
				employer: '',
				processes: [{ process: 'GTAW', qualifiedOn: '2025-01-06', reference: '' }]
			},
			foremanId
		);
		const { joint } = joints.place(
			{
				revisionId,
				pageIndex: 0,
				x: 500,
				y: 200,
				joint: {
					kind: 'butt',
					size: '3',
					thickness: '0.216 in',
					criteriaSetId: 'asme-b31.3-normal',
					ndeRequired: 'RT'
				}
			},
			inspectorId
		);
		const inspect = (body: unknown) =>
			inspections.record(
				joint.id,
				recordInspectionSchema.parse({
					version: joints.row(joint.id)!.version,
					...(body as object)
				}),
				inspectorId
			);
		const weld = (weldedOn: string) =>
			welds.record(
				joint.id,
				recordWeldSchema.parse({
					version: joints.row(joint.id)!.version,
					weldedOn,
					process: 'GTAW',
					welders: { root: 'RR1' }
				}),
				users.principal(foremanId)!
			);
		inspect({ stage: 'fitup', readings: {}, decision: 'accept' });
		weld('2025-06-10');
		inspect({ stage: 'visual', readings: {}, decision: 'accept' });
		inspect({ stage: 'nde', method: 'RT', decision: 'reject', reportNo: 'RT-1' });
		weld('2025-06-12');
		inspect({ stage: 'visual', readings: {}, decision: 'accept' });
		inspect({ stage: 'nde', method: 'RT', decision: 'accept', reportNo: 'RT-2' });
		const row = welders.list(projectId).find((w) => w.stamp === 'RR1')!;
		// The weld and its repair R1 each count once: 1 rejected of 2 examined.
		expect(row.welds).toEqual({ made: 2, examined: 2, rejected: 1, repairRate: 0.5 });
	});
});
