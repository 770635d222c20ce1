/** What the sheet viewer and the compare view load about a drawing and its revisions. */
import { error } from '@sveltejs/kit';
import * as criteriaSets from './criteria-sets';
import * as drawings from './drawings';
import * as tiles from './tiles';

export function drawingOrThrow(projectId: number, drawingId: number) {
	const drawing = drawings.get(projectId, drawingId);
	if (!drawing) error(404, 'There is no such drawing in this project.');
	return drawing;
}

export function revisionOrThrow(revisionId: number) {
	const revision = drawings.revision(revisionId);
	if (!revision) error(404, 'There is no such revision.');
	return drawings.revisionJson(revision);
}

export function sheetData(projectId: number, drawingId: number, revisionId?: number) {
	const drawing = drawingOrThrow(projectId, drawingId);
	const revisions = drawings.history(drawingId);
	const current = revisions.find((r) => r.status === 'current') ?? revisions[0];
	if (!current) error(404, 'This drawing has no revision yet.');
	const revision = revisionOrThrow(revisionId ?? current.id);
	// A revision stored before tiles existed gets them from its first view.
	tiles.ensure(revision.id);
	return {
		title: `${drawing.number} rev ${revision.label}`,
		drawing,
		revision: { ...revision, tiles: tiles.index(revision.id) },
		revisions: revisions.map(({ id, label, status, issuedOn, uploadedAt }) => ({
			id,
			label,
			status,
			issuedOn,
			uploadedAt
		})),
		current: { id: current.id, label: current.label },
		/** what the joint card's criteria set picker offers */
		criteriaChoices: criteriaSets.choices(projectId)
	};
}
