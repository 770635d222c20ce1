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
import * as projects from '$lib/server/projects';
import * as drawings from '$lib/server/drawings';
import * as counting from '$lib/server/state-counts';
import { drawingListQuery } from '$lib/schemas/drawing';
import * as welds from '$lib/server/welds';
import { recordInspectionSchema, recordWeldSchema } from '$lib/schemas/inspection';
import { outstandingQuerySchema } from '$lib/schemas/outstanding';
import { OWED_STATES } from '$lib/outstanding';
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

/** Direct SQL: each drawing of the project with joints, by number, with its joints per state. */
function drawingRows() {
	const rows = db.$client
		.prepare(
			`select d.id as id, d.number as number, d.area as area, j.state as state, count(*) as n
			 from joints j join drawings d on d.id = j.drawing_id where j.project_id = ?
			 group by d.id, j.state order by d.number, d.id`
		)
		.all(projectId) as { id: number; number: string; area: string; state: string; n: number }[];
	const byId = new Map<number, { id: number; number: string; area: string; counts: object }>();
	for (const row of rows) {
		const entry = byId.get(row.id) ?? {
			id: row.id,
			number: row.number,
			area: row.area,
			counts: {}
		};
		(entry.counts as Record<string, number>)[row.state] = row.n;
		byId.set(row.id, entry);
	}
	return [...byId.values()];
}

/** The summary with drawings as the API writes it (JSON from SQLite), zero counts left out. */
function summaryDrawings() {
	const parsed = JSON.parse(counting.summaryJson(projectId, { drawings: true })) as {
		byDrawing: { id: number; number: string; area: string; counts: Record<string, number> }[];
	};
	expect(parsed).toEqual(counting.summary(projectId, { drawings: true }));
	return parsed.byDrawing.map((row) => ({
		...row,
		counts: Object.fromEntries(Object.entries(row.counts).filter(([, n]) => n > 0))
	}));
}

/** The kept area/system counts and per-drawing JSON counts against a direct count. */
function expectKeptTables() {
	const kept = db.$client
		.prepare(
			`select project_id as projectId, area, system, state, n from area_state_counts
			 order by project_id, area, system, state`
		)
		.all();
	const direct = db.$client
		.prepare(
			`select j.project_id as projectId, d.area as area, d.system as system, j.state as state,
				count(*) as n from joints j join drawings d on d.id = j.drawing_id
			 group by j.project_id, d.area, d.system, j.state order by 1, 2, 3, 4`
		)
		.all();
	expect(kept).toEqual(direct);
	const pivot = Object.fromEntries(
		(
			db.$client.prepare('select drawing_id as id, counts from drawing_state_counts').all() as {
				id: number;
				counts: string;
			}[]
		).map((row) => [row.id, JSON.parse(row.counts) as Record<string, number>])
	);
	const perDrawing: Record<number, Record<string, number>> = {};
	for (const row of directCounts()) (perDrawing[row.drawingId] ??= {})[row.state] = row.n;
	expect(pivot).toEqual(perDrawing);
}

describe('per-drawing state counts', () => {
	it('equal a direct count for joints placed, fitted up and rejected through the app', () => {
		expect(countsTable()).toEqual(directCounts());
		expectKeptTables();
	});

	it('follow a new joint, fit-up, weld, void, a moved joint and a deleted joint', () => {
		const before = countsTable();
		const a = placeJoint();
		expect(countsTable()).toEqual(directCounts());
		expectKeptTables();
		expect(countsTable()).not.toEqual(before);

		fitup(a.id, 'accept');
		expect(joints.row(a.id)!.state).toBe('ready_to_weld');
		expect(countsTable()).toEqual(directCounts());
		expectKeptTables();

		const b = placeJoint();
		fitup(b.id, 'reject');
		expect(joints.row(b.id)!.state).toBe('fitup_rejected');
		expect(countsTable()).toEqual(directCounts());
		expectKeptTables();

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
		expectKeptTables();

		joints.voidJoint(b.id, 'Deleted by revision', joints.row(b.id)!.version, inspectorId);
		expect(joints.row(b.id)!.state).toBe('void');
		expect(countsTable()).toEqual(directCounts());
		expectKeptTables();
		expect(summaryDrawings()).toEqual(drawingRows());

		// No screen moves a joint between drawings yet; the triggers follow it all the same.
		db.update(schema.joints)
			.set({ drawingId: other.drawingId, number: `${a.number}-MOVED` })
			.where(eq(schema.joints.id, a.id))
			.run();
		expect(countsTable()).toEqual(directCounts());
		expectKeptTables();

		// A deleted joint comes off its count; a count that reaches nought is removed.
		const c = placeJoint();
		db.delete(schema.joints).where(eq(schema.joints.id, c.id)).run();
		expect(countsTable()).toEqual(directCounts());
		expectKeptTables();
		expect(countsTable().every((row) => row.n > 0)).toBe(true);
		expect(summaryDrawings()).toEqual(drawingRows());
	});

	it('give the summary and the board the areas a drawing is in now', () => {
		expect(summaryByArea()).toEqual(areaCounts());
		db.update(schema.drawings)
			.set({ area: 'Area 99 (counts test)' })
			.where(eq(schema.drawings.id, drawingId))
			.run();
		expect(countsTable()).toEqual(directCounts());
		expectKeptTables();
		expect(summaryByArea()).toEqual(areaCounts());
		expect(summaryByArea()).toHaveProperty(['Area 99 (counts test)']);
		expect(summaryDrawings()).toEqual(drawingRows());
		const board = outstanding.counts(projectId, outstandingQuerySchema.parse({}));
		const area = board.byArea.find((row) => row.area === 'Area 99 (counts test)');
		expect(area?.counts).toEqual(areaCounts()['Area 99 (counts test)']);
		const filtered = outstanding.counts(
			projectId,
			outstandingQuerySchema.parse({ area: 'Area 99 (counts test)' })
		);
		expect(filtered.total).toEqual(areaCounts()['Area 99 (counts test)']);
		// The owed lists' totals come from the same counts: each equals a direct count.
		for (const query of [{}, { area: 'Area 99 (counts test)' }, { drawing: other.drawingId }]) {
			const whole = outstanding.board(projectId, outstandingQuerySchema.parse(query));
			// Each drawing row, the totals and the areas equal a direct count of the joints.
			const scoped = drawingRows().filter(
				(row) =>
					('area' in query ? row.area === query.area : true) &&
					('drawing' in query ? row.id === query.drawing : true)
			);
			expect(whole.counts.drawingsTotal).toBe(scoped.length);
			// Owing most first, then by number.
			const owedOf = (counts: Record<string, number>) =>
				[...OWED_STATES.foreman, ...OWED_STATES.inspector].reduce(
					(sum, state) => sum + (counts[state] ?? 0),
					0
				);
			const order = whole.counts.byDrawing.map((row) => [owedOf(row.counts), row.number] as const);
			expect(order).toEqual(
				[...order].sort((x, y) => y[0] - x[0] || (x[1] < y[1] ? -1 : x[1] > y[1] ? 1 : 0))
			);
			for (const row of whole.counts.byDrawing)
				expect(row.counts).toEqual(scoped.find((direct) => direct.id === row.drawingId)?.counts);
			const total: Record<string, number> = {};
			for (const row of scoped)
				for (const [state, n] of Object.entries(row.counts as Record<string, number>))
					total[state] = (total[state] ?? 0) + n;
			expect(whole.counts.total).toEqual(total);
			for (const list of [...whole.owed.foreman, ...whole.owed.inspector]) {
				const alone = outstanding.owedList(
					projectId,
					list.state,
					outstandingQuerySchema.parse(query)
				);
				expect(list.total).toBe(alone.total);
				expect(list.items).toEqual(alone.items);
			}
		}
	});

	it('follow a drawing moved to another system and a drawing deleted with its joints', async () => {
		db.update(schema.drawings)
			.set({ system: 'SYS-moved (counts test)' })
			.where(eq(schema.drawings.id, other.drawingId))
			.run();
		expectKeptTables();
		const board = outstanding.counts(projectId, outstandingQuerySchema.parse({}));
		expect(board.bySystem.some((row) => row.system === 'SYS-moved (counts test)')).toBe(true);
		const job = await makeProject();
		const gone = await makeDrawing(job, { area: 'Area gone' });
		makeJoint(gone);
		makeJoint(gone);
		expectKeptTables();
		db.delete(schema.joints).where(eq(schema.joints.drawingId, gone.drawingId)).run();
		makeJoint(gone);
		expectKeptTables();
		db.delete(schema.drawings).where(eq(schema.drawings.id, gone.drawingId)).run();
		expect(countsTable()).toEqual(directCounts());
		expectKeptTables();
		db.delete(schema.projects).where(eq(schema.projects.id, job.drawing.projectId)).run();
		expect(countsTable()).toEqual(directCounts());
		expectKeptTables();
	});

	it('give the project overview and the drawing register the same counts as the joints', () => {
		const direct = (sqlText: string) => {
			const out: Record<string, Record<string, number>> = {};
			for (const row of db.$client.prepare(sqlText).all(projectId) as {
				key: string | number;
				state: string;
				n: number;
			}[])
				(out[String(row.key)] ??= {})[row.state] = row.n;
			return out;
		};
		const nonZero = (counts: Record<string, number>) =>
			Object.fromEntries(Object.entries(counts).filter(([, n]) => n > 0));

		const project = projects.stateCounts([projectId]).get(projectId)!;
		expect(nonZero(project)).toEqual(
			direct(
				'select project_id as key, state, count(*) as n from joints where project_id = ? group by state'
			)[projectId]
		);
		expect(
			Object.fromEntries(
				projects.stateCountsByArea(projectId).map(({ area, counts }) => [area, nonZero(counts)])
			)
		).toEqual(areaCounts());

		const register = drawings.list(projectId, drawingListQuery.parse({}));
		const perDrawing = direct(
			'select drawing_id as key, state, count(*) as n from joints where project_id = ? group by drawing_id, state'
		);
		expect(register.items.length).toBeGreaterThan(1);
		for (const item of register.items)
			expect(nonZero(item.counts)).toEqual(perDrawing[item.id] ?? {});
	});
});
