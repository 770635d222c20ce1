/**
 * The outstanding board: GET /api/projects/{id}/outstanding and its module against a real
 * SQLite file with a project made by the test factory. Counts are checked against direct SQL counts, owed lists
 * against their order (oldest in the state first) and the filters against what they name.
 */
import { and, eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import * as joints from '$lib/server/joints';
import * as inspections from '$lib/server/inspections';
import * as outstanding from '$lib/server/outstanding';
import * as welds from '$lib/server/welds';
import * as users from '$lib/server/users';
import { OWED_STATES } from '$lib/outstanding';
import { recordInspectionSchema, recordWeldSchema } from '$lib/schemas/inspection';
import { outstandingQuerySchema } from '$lib/schemas/outstanding';
import { GET } from '../../src/routes/api/projects/[projectId=id]/outstanding/+server';
import { makeDrawing, makeProject } from '../fixtures/projects';
import { makeJoint } from '../fixtures/joints';
import { qualifiedWelder } from '../fixtures/welders';

type Handler = (event: never) => Response | Promise<Response>;

let projectId: number;
let revisionId: number;
let drawingId: number;
let inspectorId: string;
let foremanId: string;

beforeAll(async () => {
	const job = await makeProject();
	({ inspector: inspectorId, foreman: foremanId } = job.users);
	({ projectId, revisionId, drawingId } = job.drawing);
	// Joints on two drawings in two areas, awaiting fit-up and ready to weld, for the counts.
	const other = await makeDrawing(job, { area: 'Area 2', system: 'Utility' });
	for (const drawing of [job.drawing, other]) {
		makeJoint(drawing);
		const { joint } = makeJoint(drawing);
		inspections.record(
			joint.id,
			recordInspectionSchema.parse({
				version: joint.version,
				stage: 'fitup',
				readings: {},
				decision: 'accept'
			}),
			inspectorId
		);
	}
});

const query = (q: Record<string, string | number> = {}) => outstandingQuerySchema.parse(q);

let placed = 0;
function placeJoint(accepted: boolean) {
	placed++;
	const { joint } = joints.place(
		{
			revisionId,
			pageIndex: 0,
			x: 60 + placed * 4,
			y: 380,
			joint: {
				kind: 'butt',
				size: '3',
				thickness: '0.216 in',
				criteriaSetId: 'asme-b31.3-normal',
				wps: 'WPS-CS-01 GTAW/SMAW'
			}
		},
		inspectorId
	);
	if (accepted) {
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
	}
	return joints.row(joint.id)!;
}

/** Direct SQL: joints of the project by state, optionally by area. */
function sqlCounts(where = '', ...params: (string | number)[]) {
	return db.$client
		.prepare(
			`select j.state as state, count(*) as n from joints j join drawings d on d.id = j.drawing_id
			 where j.project_id = ? ${where} group by j.state`
		)
		.all(projectId, ...params) as { state: string; n: number }[];
}

const asRecord = (rows: { state: string; n: number }[]) =>
	Object.fromEntries(rows.map((r) => [r.state, r.n]));

describe('joint counts', () => {
	it('agree with direct SQL counts for the project, each area, each system and each drawing', () => {
		const { counts } = outstanding.board(projectId, query());
		expect(counts.total).toEqual(asRecord(sqlCounts()));
		expect(counts.byArea.length).toBeGreaterThan(0);
		for (const { area, counts: c } of counts.byArea) {
			expect(c, `area ${area}`).toEqual(asRecord(sqlCounts('and d.area = ?', area)));
		}
		for (const { area, system, counts: c } of counts.bySystem) {
			expect(c, `${area} / ${system}`).toEqual(
				asRecord(sqlCounts('and d.area = ? and d.system = ?', area, system))
			);
		}
		for (const { drawingId: id, counts: c } of counts.byDrawing) {
			expect(c).toEqual(asRecord(sqlCounts('and d.id = ?', id)));
		}
	});
});

describe('owed lists', () => {
	it('give each role its states, oldest in the state first, with totals as SQL counts them', () => {
		const oldest = placeJoint(true);
		const middle = placeJoint(true);
		const newest = placeJoint(true);
		const base = Date.UTC(2020, 0, 1);
		for (const [joint, offset] of [
			[newest, 3],
			[oldest, 1],
			[middle, 2]
		] as const) {
			db.update(schema.joints)
				.set({ stateSince: base + offset * 3_600_000 })
				.where(eq(schema.joints.id, joint.id))
				.run();
		}
		const { owed } = outstanding.board(projectId, query({ limit: 200 }));
		expect(owed.foreman.map((g) => g.state)).toEqual(OWED_STATES.foreman);
		expect(owed.inspector.map((g) => g.state)).toEqual(OWED_STATES.inspector);
		const totals = asRecord(sqlCounts());
		for (const group of [...owed.foreman, ...owed.inspector]) {
			expect(group.total, group.state).toBe(totals[group.state] ?? 0);
			const since = group.items.map((i) => i.stateSince);
			expect(since).toEqual([...since].sort((a, b) => a - b));
		}
		const ready = owed.foreman.find((g) => g.state === 'ready_to_weld')!;
		expect(ready.items.slice(0, 3).map((i) => i.jointId)).toEqual([
			oldest.id,
			middle.id,
			newest.id
		]);
		// Each row opens the sheet zoomed to its pin.
		expect(ready.items[0].href).toBe(
			`/projects/${projectId}/drawings/${drawingId}?page=1&weld=${encodeURIComponent(oldest.number)}`
		);
	});

	it('are capped by the limit while the total still counts them all', () => {
		const { owed } = outstanding.board(projectId, query({ limit: 1 }));
		const ready = owed.foreman.find((g) => g.state === 'ready_to_weld')!;
		expect(ready.items).toHaveLength(1);
		expect(ready.total).toBeGreaterThan(1);
	});
});

describe('filters', () => {
	it('by area and by drawing keep to what they name, with SQL totals', () => {
		const { counts } = outstanding.board(projectId, query());
		const area = counts.byArea[0].area;
		const byArea = outstanding.board(projectId, query({ area, limit: 200 }));
		expect(byArea.counts.total).toEqual(asRecord(sqlCounts('and d.area = ?', area)));
		for (const group of [...byArea.owed.foreman, ...byArea.owed.inspector]) {
			for (const item of group.items) expect(item.area).toBe(area);
		}
		const byDrawing = outstanding.board(projectId, query({ drawing: drawingId, limit: 200 }));
		expect(byDrawing.counts.total).toEqual(asRecord(sqlCounts('and d.id = ?', drawingId)));
		expect(byDrawing.counts.byDrawing.map((d) => d.drawingId)).toEqual([drawingId]);
	});

	it('by welder shows the joints that welder stamped', () => {
		const stamp = qualifiedWelder(projectId, 'OB');
		const welder = db
			.select()
			.from(schema.welders)
			.where(and(eq(schema.welders.projectId, projectId), eq(schema.welders.stamp, stamp)))
			.get()!;
		const joint = placeJoint(true);
		welds.record(
			joint.id,
			recordWeldSchema.parse({
				version: joints.row(joint.id)!.version,
				weldedOn: '2025-06-10',
				process: 'GTAW',
				welders: { root: stamp, fill: stamp, cap: stamp }
			}),
			users.principal(foremanId)!
		);
		const board = outstanding.board(projectId, query({ welder: welder.id }));
		const rows = [...board.owed.foreman, ...board.owed.inspector].flatMap((g) => g.items);
		expect(rows.map((r) => r.jointId)).toEqual([joint.id]);
		expect(rows[0].state).toBe('awaiting_visual');
		expect(board.counts.total).toEqual({ awaiting_visual: 1 });
	});
});

describe('GET /api/projects/{id}/outstanding', () => {
	const get = async (search: string) => {
		const response = await (GET as unknown as Handler)({
			url: new URL(`http://localhost/api/projects/${projectId}/outstanding${search}`),
			locals: { user: users.principal(foremanId)!, projectId }
		} as never);
		return { status: response.status, body: await response.json() };
	};

	it('answers the board, and 400 naming a bad filter', async () => {
		const ok = await get('?limit=5');
		expect(ok.status).toBe(200);
		expect(ok.body.owed.inspector).toHaveLength(3);
		expect(typeof ok.body.now).toBe('number');
		const bad = await get('?limit=5000');
		expect(bad.status).toBe(400);
		expect(bad.body.field).toBe('limit');
	});

	// Rule: `?list={state}&offset=` answers one owed list (README, API table).
	it('pages one owed list with list and offset, oldest first, without a gap or a repeat', async () => {
		for (let n = 0; n < 5; n++) placeJoint(true);
		const whole = outstanding.board(projectId, query({ limit: 200 }));
		const ready = whole.owed.foreman.find((g) => g.state === 'ready_to_weld')!;
		expect(ready.total).toBeGreaterThan(4);
		const seen: number[] = [];
		for (let offset = 0; offset < ready.total; offset += 2) {
			const page = await get(`?list=ready_to_weld&offset=${offset}&limit=2`);
			expect(page.status).toBe(200);
			expect(page.body.state).toBe('ready_to_weld');
			expect(page.body.total).toBe(ready.total);
			expect(page.body.offset).toBe(offset);
			expect(page.body).not.toHaveProperty('counts');
			seen.push(...page.body.items.map((i: { jointId: number }) => i.jointId));
		}
		expect(seen).toEqual(ready.items.map((i) => i.jointId));
		const past = await get(`?list=ready_to_weld&offset=${ready.total}`);
		expect(past.body.items).toEqual([]);
		// The board itself always starts each list at its oldest joint.
		const board = await get('?offset=3&limit=1');
		expect(board.body.owed.foreman[0].offset).toBe(0);
		for (const [search, field] of [
			['?list=accepted', 'list'],
			['?list=ready_to_weld&offset=-1', 'offset'],
			['?list=ready_to_weld&offset=x', 'offset']
		]) {
			const bad = await get(search);
			expect(bad.status, search).toBe(400);
			expect(bad.body.field, search).toBe(field);
		}
	});
});
