/**
 * Joints per state, read from the counts SQLite triggers keep (table `joint_state_counts`,
 * drawing × state → n, drizzle/0002_joint_state_counts.sql): the one place the server counts
 * joints by state for a project, an area or a drawing, so no request groups over the joints.
 */
import { asc, eq, inArray, sql } from 'drizzle-orm';
import { db, schema } from './db';
import { emptyCounts, type StateCounts } from '$lib/state-counts';

const c = schema.jointStateCounts;
const d = schema.drawings;

/** Joints per state for each of the given projects. */
export function byProject(projectIds: readonly number[]): Map<number, StateCounts> {
	const result = new Map(projectIds.map((id) => [id, emptyCounts()]));
	if (projectIds.length === 0) return result;
	const rows = db
		.select({ projectId: c.projectId, state: c.state, n: sql<number>`sum(${c.n})` })
		.from(c)
		.where(inArray(c.projectId, [...projectIds]))
		.groupBy(c.projectId, c.state)
		.all();
	for (const row of rows) result.get(row.projectId)![row.state] += row.n;
	return result;
}

/** Joints per state in each area of the project (the area its drawing is in now), by area. */
export function byArea(projectId: number): { area: string; counts: StateCounts }[] {
	const rows = db
		.select({ area: d.area, state: c.state, n: sql<number>`sum(${c.n})` })
		.from(c)
		.innerJoin(d, eq(d.id, c.drawingId))
		.where(eq(c.projectId, projectId))
		.groupBy(d.area, c.state)
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
	const perDrawing = new Map<number, StateCounts>();
	for (const row of db
		.select({ drawingId: c.drawingId, state: c.state, n: c.n })
		.from(c)
		.where(eq(c.projectId, projectId))
		.all()) {
		const counts = perDrawing.get(row.drawingId) ?? emptyCounts();
		counts[row.state] += row.n;
		perDrawing.set(row.drawingId, counts);
	}
	const result: { id: number; number: string; area: string; counts: StateCounts }[] = [];
	for (const drawing of db
		.select({ id: d.id, number: d.number, area: d.area })
		.from(d)
		.where(eq(d.projectId, projectId))
		.orderBy(asc(d.number))
		.all()) {
		const counts = perDrawing.get(drawing.id);
		if (counts) result.push({ ...drawing, counts });
	}
	return result;
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
