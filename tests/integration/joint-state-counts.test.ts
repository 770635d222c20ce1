/**
 * The per-drawing state counts (joint_state_counts, kept by triggers on joints) against a
 * direct GROUP BY over the joints, after each kind of change a joint goes through, and the
 * summary and board counts read from them against direct SQL.
 */
import { eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import * as joints from '$lib/server/joints';
import * as users from '$lib/server/users';
import * as inspections from '$lib/server/inspections';
import * as outstanding from '$lib/server/outstanding';
import * as weldLog from '$lib/server/weld-log';
import * as welds from '$lib/server/welds';
import { recordInspectionSchema, recordWeldSchema } from '$lib/schemas/inspection';
import { outstandingQuerySchema } from '$lib/schemas/outstanding';
import { countsTable, directCounts } from '../fixtures/state-counts';
import { makeDrawing, makeProject, type MadeDrawing } from '../fixtures/projects';
import { makeJoint } from '../fixtures/joints';
import { qualifiedWelder } from '../fixtures/welders';

let projectId: number;
let revisionId: number;
let drawingId: number;
let inspectorId: string;
let foremanId: string;
let other: MadeDrawing;

beforeAll(async () => {
	const job = await makeProject();
	({ inspector: inspectorId, foreman: foremanId } = job.users);
	({ projectId, revisionId, drawingId } = job.drawing);
	// Joints on two drawings in two areas before the tests change any.
	other = await makeDrawing(job, { area: 'Area 2' });
	for (const drawing of [job.drawing, other]) {
		makeJoint(drawing);
		fitup(makeJoint(drawing).joint.id, 'accept');
		fitup(makeJoint(drawing).joint.id, 'reject');
	}
});

let placed = 0;
function placeJoint() {
	placed++;
	return joints.place(
		{
			revisionId,
			pageIndex: 0,
			x: 80 + placed * 5,
			y: 420,
			joint: {
				kind: 'butt',
				size: '3',
				thickness: '0.216 in',
				criteriaSetId: 'asme-b31.3-normal',
				wps: 'WPS-CS-01 GTAW/SMAW'
			}
		},
		inspectorId
	).joint;
}

const fitup = (jointId: number, decision: 'accept' | 'reject') =>
	inspections.record(
		jointId,
		recordInspectionSchema.parse({
			version: joints.row(jointId)!.version,
			stage: 'fitup',
			readings: {},
			decision
		}),
		inspectorId
	);

/** Direct SQL: joints of the project per area and state, through their drawing's area now. */
function areaCounts() {
	const rows = db.$client
		.prepare(
			`select d.area as area, j.state as state, count(*) as n from joints j
			 join drawings d on d.id = j.drawing_id where j.project_id = ? group by d.area, j.state`
		)
		.all(projectId) as { area: string; state: string; n: number }[];
	const byArea: Record<string, Record<string, number>> = {};
	for (const row of rows) (byArea[row.area] ??= {})[row.state] = row.n;
	return byArea;
}

function summaryByArea() {
	return Object.fromEntries(
		weldLog
			.summary(projectId)
			.byArea.map(({ area, counts }) => [
				area,
				Object.fromEntries(Object.entries(counts).filter(([, n]) => n > 0))
			])
	);
}

describe('per-drawing state counts', () => {
	it('equal a direct count for joints placed, fitted up and rejected through the app', () => {
		expect(countsTable()).toEqual(directCounts());
	});

	it('follow a new joint, fit-up, weld, void, a moved joint and a deleted joint', () => {
		const before = countsTable();
		const a = placeJoint();
		expect(countsTable()).toEqual(directCounts());
		expect(countsTable()).not.toEqual(before);

		fitup(a.id, 'accept');
		expect(joints.row(a.id)!.state).toBe('ready_to_weld');
		expect(countsTable()).toEqual(directCounts());

		const b = placeJoint();
		fitup(b.id, 'reject');
		expect(joints.row(b.id)!.state).toBe('fitup_rejected');
		expect(countsTable()).toEqual(directCounts());

		const stamp = qualifiedWelder(projectId, 'SC');
		welds.record(
			a.id,
			recordWeldSchema.parse({
				version: joints.row(a.id)!.version,
				weldedOn: '2025-06-10',
				process: 'GTAW',
				welders: { root: stamp, fill: stamp, cap: stamp }
			}),
			users.principal(foremanId)!
		);
		expect(joints.row(a.id)!.state).toBe('awaiting_visual');
		expect(countsTable()).toEqual(directCounts());

		joints.voidJoint(b.id, 'Deleted by revision', joints.row(b.id)!.version, inspectorId);
		expect(joints.row(b.id)!.state).toBe('void');
		expect(countsTable()).toEqual(directCounts());

		// No screen moves a joint between drawings yet; the triggers follow it all the same.
		db.update(schema.joints)
			.set({ drawingId: other.drawingId, number: `${a.number}-MOVED` })
			.where(eq(schema.joints.id, a.id))
			.run();
		expect(countsTable()).toEqual(directCounts());

		// A deleted joint comes off its count; a count that reaches nought is removed.
		const c = placeJoint();
		db.delete(schema.joints).where(eq(schema.joints.id, c.id)).run();
		expect(countsTable()).toEqual(directCounts());
		expect(countsTable().every((row) => row.n > 0)).toBe(true);
	});

	it('give the summary and the board the areas a drawing is in now', () => {
		expect(summaryByArea()).toEqual(areaCounts());
		db.update(schema.drawings)
			.set({ area: 'Area 99 (counts test)' })
			.where(eq(schema.drawings.id, drawingId))
			.run();
		expect(countsTable()).toEqual(directCounts());
		expect(summaryByArea()).toEqual(areaCounts());
		expect(summaryByArea()).toHaveProperty(['Area 99 (counts test)']);
		const board = outstanding.counts(projectId, outstandingQuerySchema.parse({}));
		const area = board.byArea.find((row) => row.area === 'Area 99 (counts test)');
		expect(area?.counts).toEqual(areaCounts()['Area 99 (counts test)']);
		const filtered = outstanding.counts(
			projectId,
			outstandingQuerySchema.parse({ area: 'Area 99 (counts test)' })
		);
		expect(filtered.total).toEqual(areaCounts()['Area 99 (counts test)']);
	});
});
