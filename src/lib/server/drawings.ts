/** The drawing register: drawings, their revisions and sheets. */
import { and, asc, count, eq } from 'drizzle-orm';
import { db, schema } from './db';
import { emptyCounts, type StateCounts } from '$lib/state-counts';

/** Every drawing of a project with its current revision and its joints per state. */
export function listWithCurrent(projectId: number) {
	const rows = db
		.select({
			id: schema.drawings.id,
			number: schema.drawings.number,
			title: schema.drawings.title,
			kind: schema.drawings.kind,
			line: schema.drawings.line,
			area: schema.drawings.area,
			system: schema.drawings.system,
			revisionId: schema.revisions.id,
			revision: schema.revisions.label,
			issuedOn: schema.revisions.issuedOn,
			pageCount: schema.revisions.pageCount
		})
		.from(schema.drawings)
		.leftJoin(
			schema.revisions,
			and(
				eq(schema.revisions.drawingId, schema.drawings.id),
				eq(schema.revisions.status, 'current')
			)
		)
		.where(eq(schema.drawings.projectId, projectId))
		.orderBy(asc(schema.drawings.number))
		.all();
	const counts = db
		.select({ drawingId: schema.joints.drawingId, state: schema.joints.state, n: count() })
		.from(schema.joints)
		.where(eq(schema.joints.projectId, projectId))
		.groupBy(schema.joints.drawingId, schema.joints.state)
		.all();
	const byDrawing = new Map<number, StateCounts>();
	for (const c of counts) {
		const entry = byDrawing.get(c.drawingId) ?? emptyCounts();
		entry[c.state] = c.n;
		byDrawing.set(c.drawingId, entry);
	}
	return rows.map((row) => ({ ...row, counts: byDrawing.get(row.id) ?? emptyCounts() }));
}
