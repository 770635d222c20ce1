/**
 * Joints per state, read from the counts SQLite triggers keep: the one place the server
 * counts joints by state for a project, an area, a system or a drawing, so no request groups
 * over the joints. `joint_state_counts` (drawing × state → n) is kept from `joints`
 * (drizzle/0002); `area_state_counts` (project × area × system × state → n) and
 * `drawing_state_counts` (a drawing's counts as one JSON object) are kept from it and from
 * `drawings` (drizzle/0006). A plant job's 100,000 joints are a few hundred area rows and
 * one row per drawing.
 */
import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { db, schema } from './db';
import { emptyCounts, type StateCounts } from '$lib/state-counts';

const c = schema.jointStateCounts;
const a = schema.areaStateCounts;
const p = schema.drawingStateCounts;
const d = schema.drawings;

/** Joints per state for each of the given projects. */
export function byProject(projectIds: readonly number[]): Map<number, StateCounts> {
	const result = new Map(projectIds.map((id) => [id, emptyCounts()]));
	if (projectIds.length === 0) return result;
	const rows = db
		.select({ projectId: a.projectId, state: a.state, n: sql<number>`sum(${a.n})` })
		.from(a)
		.where(inArray(a.projectId, [...projectIds]))
		.groupBy(a.projectId, a.state)
		.all();
	for (const row of rows) result.get(row.projectId)![row.state] += row.n;
	return result;
}

/** Joints per state in each area of the project (the area its drawing is in now), by area. */
export function byArea(projectId: number): { area: string; counts: StateCounts }[] {
	const rows = db
		.select({ area: a.area, state: a.state, n: sql<number>`sum(${a.n})` })
		.from(a)
		.where(eq(a.projectId, projectId))
		.groupBy(a.area, a.state)
		.all();
	const areas = new Map<string, StateCounts>();
	for (const row of rows) {
		const counts = areas.get(row.area) ?? emptyCounts();
		counts[row.state] += row.n;
		areas.set(row.area, counts);
	}
	return [...areas]
		.sort(([a], [b]) => a.localeCompare(b))
		.map(([area, counts]) => ({ area, counts }));
}

/** Rows of (area, system, state, n) of the project, or of one area of it. */
export function byAreaAndSystem(projectId: number, area?: string) {
	return db
		.select({ area: a.area, system: a.system, state: a.state, n: a.n })
		.from(a)
		.where(and(eq(a.projectId, projectId), area !== undefined ? eq(a.area, area) : undefined))
		.all();
}

/** Joints per state for each of the given drawings that has joints. */
export function byDrawing(drawingIds: readonly number[]): Map<number, StateCounts> {
	const result = new Map<number, StateCounts>();
	if (drawingIds.length === 0) return result;
	const rows = db
		.select({ drawingId: c.drawingId, state: c.state, n: c.n })
		.from(c)
		.where(inArray(c.drawingId, [...drawingIds]))
		.all();
	for (const row of rows) {
		const counts = result.get(row.drawingId) ?? emptyCounts();
		counts[row.state] += row.n;
		result.set(row.drawingId, counts);
	}
	return result;
}

/** Each drawing of the project with joints, in number order, with its joints per state. */
export function drawingsOfProject(projectId: number) {
	return db
		.select({ id: d.id, number: d.number, area: d.area, counts: p.counts })
		.from(p)
		.innerJoin(d, eq(d.id, p.drawingId))
		.where(eq(p.projectId, projectId))
		.orderBy(asc(d.number))
		.all()
		.map((row) => ({ ...row, counts: { ...emptyCounts(), ...row.counts } }));
}

/** The project's joints per state in total and per area; each drawing's too when asked. */
export function summary(projectId: number, { drawings = false } = {}) {
	const byAreaRows = byArea(projectId);
	const counts = emptyCounts();
	for (const { counts: area } of byAreaRows)
		for (const state of Object.keys(area) as (keyof StateCounts)[]) counts[state] += area[state];
	return {
		counts,
		byArea: byAreaRows,
		...(drawings ? { byDrawing: drawingsOfProject(projectId) } : {})
	};
}

/**
 * Each drawing of the project with joints as the JSON text of `drawingsOfProject`, written by
 * SQLite from the kept per-drawing rows (the states with none filled in with 0, in the order
 * of JOINT_STATES), so thousands of drawings cost no JavaScript objects on the way out.
 */
const drawingsJson = () =>
	db.$client.prepare<[string, number], { json: string | null }>(
		`select json_group_array(json_object('id', d.id, 'number', d.number, 'area', d.area,
			'counts', json_patch(?, p.counts)) order by d.number) as json
		from drawing_state_counts p join drawings d on d.id = p.drawing_id where p.project_id = ?`
	);
let drawingsStatement: ReturnType<typeof drawingsJson> | undefined;
const zeros = JSON.stringify(emptyCounts());

/** `summary` as JSON text, the per-drawing part written by SQLite (see `drawingsJson`). */
export function summaryJson(projectId: number, { drawings = false } = {}): string {
	const base = JSON.stringify(summary(projectId));
	if (!drawings) return base;
	drawingsStatement ??= drawingsJson();
	const byDrawing = drawingsStatement.get(zeros, projectId)?.json ?? '[]';
	return `${base.slice(0, -1)},"byDrawing":${byDrawing}}`;
}
