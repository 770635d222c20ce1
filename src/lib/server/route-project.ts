/**
 * Which project a request belongs to, from its route parameters. Every id in the path must
 * belong to that project, so a drawing of another project is as absent as a missing one.
 */
import { and, eq } from 'drizzle-orm';
import { db, schema } from './db';

function projectOfDrawing(drawingId: number): number | undefined {
	return db
		.select({ projectId: schema.drawings.projectId })
		.from(schema.drawings)
		.where(eq(schema.drawings.id, drawingId))
		.get()?.projectId;
}

function projectOfRevision(revisionId: number): number | undefined {
	return db
		.select({ projectId: schema.drawings.projectId })
		.from(schema.revisions)
		.innerJoin(schema.drawings, eq(schema.drawings.id, schema.revisions.drawingId))
		.where(eq(schema.revisions.id, revisionId))
		.get()?.projectId;
}

function projectOfJoint(jointId: number): number | undefined {
	return db
		.select({ projectId: schema.joints.projectId })
		.from(schema.joints)
		.where(eq(schema.joints.id, jointId))
		.get()?.projectId;
}

function projectOfPin(pinId: number): number | undefined {
	return db
		.select({ projectId: schema.joints.projectId })
		.from(schema.pins)
		.innerJoin(schema.joints, eq(schema.joints.id, schema.pins.jointId))
		.where(eq(schema.pins.id, pinId))
		.get()?.projectId;
}

function projectOfWps(wpsId: number): number | undefined {
	return db
		.select({ projectId: schema.wps.projectId })
		.from(schema.wps)
		.where(eq(schema.wps.id, wpsId))
		.get()?.projectId;
}

function projectOfExport(exportId: number): number | undefined {
	return db
		.select({ projectId: schema.exports.projectId })
		.from(schema.exports)
		.where(eq(schema.exports.id, exportId))
		.get()?.projectId;
}

function projectOfLot(lotId: number): number | undefined {
	return db
		.select({ projectId: schema.ndeLots.projectId })
		.from(schema.ndeLots)
		.where(eq(schema.ndeLots.id, lotId))
		.get()?.projectId;
}

function projectOfInspection(inspectionId: number): number | undefined {
	return db
		.select({ projectId: schema.joints.projectId })
		.from(schema.inspections)
		.innerJoin(schema.joints, eq(schema.joints.id, schema.inspections.jointId))
		.where(eq(schema.inspections.id, inspectionId))
		.get()?.projectId;
}

function projectOfPhoto(photoId: number): number | undefined {
	return db
		.select({ projectId: schema.joints.projectId })
		.from(schema.photos)
		.innerJoin(schema.inspections, eq(schema.inspections.id, schema.photos.inspectionId))
		.innerJoin(schema.joints, eq(schema.joints.id, schema.inspections.jointId))
		.where(eq(schema.photos.id, photoId))
		.get()?.projectId;
}

/** The project's id, or null when the route has no project or an id in it does not exist. */
export function projectOf(params: Partial<Record<string, string>>): number | null {
	const found = new Set<number | undefined>();
	if (params.projectId) {
		const id = Number(params.projectId);
		found.add(
			db
				.select({ id: schema.projects.id })
				.from(schema.projects)
				.where(eq(schema.projects.id, id))
				.get()?.id
		);
	}
	if (params.drawingId) found.add(projectOfDrawing(Number(params.drawingId)));
	if (params.revisionId) {
		const projectId = projectOfRevision(Number(params.revisionId));
		found.add(projectId);
		if (params.drawingId && projectId !== undefined) {
			const sameDrawing = db
				.select({ id: schema.revisions.id })
				.from(schema.revisions)
				.where(
					and(
						eq(schema.revisions.id, Number(params.revisionId)),
						eq(schema.revisions.drawingId, Number(params.drawingId))
					)
				)
				.get();
			if (!sameDrawing) return null;
		}
	}
	if (params.jointId) found.add(projectOfJoint(Number(params.jointId)));
	if (params.pinId) found.add(projectOfPin(Number(params.pinId)));
	if (params.exportId) found.add(projectOfExport(Number(params.exportId)));
	if (params.lotId) found.add(projectOfLot(Number(params.lotId)));
	if (params.wpsId) found.add(projectOfWps(Number(params.wpsId)));
	if (params.inspectionId) found.add(projectOfInspection(Number(params.inspectionId)));
	if (params.photoId) found.add(projectOfPhoto(Number(params.photoId)));
	if (found.size !== 1) return null;
	const [projectId] = found;
	return projectId ?? null;
}
