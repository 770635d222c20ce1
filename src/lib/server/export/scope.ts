/**
 * Which drawings, revisions, sheets and joints a turnover set holds. Everything is read in a
 * few SQL queries keyed by drawing, so a whole-project set of thousands of drawings stays cheap.
 */
import crypto from 'node:crypto';
import { and, asc, count, desc, eq, inArray, ne } from 'drizzle-orm';
import { db, schema } from '../db';
import { completeJoints, emptyCounts } from '$lib/state-counts';
import { COMPLETE_STATES } from '$lib/joint-state';
import type { ExportPreview as Preview, ExportRequest } from '$lib/schemas/export';

export type { Preview };

const d = schema.drawings;
const r = schema.revisions;
const j = schema.joints;

export interface ScopeSheet {
	pageIndex: number;
	x0: number;
	y0: number;
	x1: number;
	y1: number;
	rotation: 0 | 90 | 180 | 270;
}

export interface ScopeRevision {
	id: number;
	label: string;
	status: 'current' | 'superseded';
	fileKey: string;
	sha256: string;
	bytes: number;
	/** The revision that replaced this one, for the superseded mark. */
	supersededBy: string | null;
	sheets: ScopeSheet[];
}

export interface ScopeDrawing {
	id: number;
	number: string;
	title: string;
	area: string;
	system: string;
	/** Current first, then superseded ones newest first. */
	revisions: ScopeRevision[];
}

/** Drawings of the project the scope names, in drawing-number order. */
export function drawingsIn(projectId: number, request: ExportRequest) {
	const { scope } = request;
	const where = and(
		eq(d.projectId, projectId),
		scope.drawings ? inArray(d.id, scope.drawings) : undefined,
		scope.area ? eq(d.area, scope.area) : undefined,
		scope.system ? eq(d.system, scope.system) : undefined
	);
	return db
		.select({ id: d.id, number: d.number, title: d.title, area: d.area, system: d.system })
		.from(d)
		.where(where)
		.orderBy(asc(d.number), asc(d.id))
		.all();
}

export function resolve(projectId: number, request: ExportRequest): ScopeDrawing[] {
	const found = drawingsIn(projectId, request);
	if (found.length === 0) return [];
	const revisionRows = db
		.select({
			id: r.id,
			drawingId: r.drawingId,
			label: r.label,
			status: r.status,
			fileKey: r.fileKey,
			sha256: r.sha256,
			bytes: r.bytes,
			uploadedAt: r.uploadedAt
		})
		.from(r)
		.where(
			and(
				inArray(
					r.drawingId,
					found.map((f) => f.id)
				),
				request.includeSuperseded ? undefined : eq(r.status, 'current')
			)
		)
		.orderBy(asc(r.drawingId), desc(r.uploadedAt), desc(r.id))
		.all();
	const sheetRows = revisionRows.length
		? db
				.select()
				.from(schema.pages)
				.where(
					inArray(
						schema.pages.revisionId,
						revisionRows.map((rev) => rev.id)
					)
				)
				.orderBy(asc(schema.pages.revisionId), asc(schema.pages.pageIndex))
				.all()
		: [];
	const sheetsOf = new Map<number, ScopeSheet[]>();
	for (const s of sheetRows) {
		const list = sheetsOf.get(s.revisionId) ?? [];
		list.push({
			pageIndex: s.pageIndex,
			x0: s.x0,
			y0: s.y0,
			x1: s.x1,
			y1: s.y1,
			rotation: s.rotation
		});
		sheetsOf.set(s.revisionId, list);
	}
	const byDrawing = new Map<number, typeof revisionRows>();
	for (const rev of revisionRows)
		byDrawing.set(rev.drawingId, [...(byDrawing.get(rev.drawingId) ?? []), rev]);

	return found.map((drawing) => {
		const revs = byDrawing.get(drawing.id) ?? [];
		// Newest first by upload; the current one leads whatever its upload time.
		const ordered = [
			...revs.filter((rev) => rev.status === 'current'),
			...revs.filter((rev) => rev.status !== 'current')
		];
		return {
			...drawing,
			revisions: ordered.map((rev) => {
				const newer = revs.filter(
					(o) => o.uploadedAt > rev.uploadedAt || (o.uploadedAt === rev.uploadedAt && o.id > rev.id)
				);
				return {
					id: rev.id,
					label: rev.label,
					status: rev.status,
					fileKey: rev.fileKey,
					sha256: rev.sha256,
					bytes: rev.bytes,
					supersededBy: rev.status === 'superseded' ? (newer.at(-1)?.label ?? null) : null,
					sheets: sheetsOf.get(rev.id) ?? []
				};
			})
		};
	});
}

/** What the set will hold, counted in SQL; the scope page shows it before a job starts. */
export function preview(projectId: number, request: ExportRequest): Preview {
	const found = resolve(projectId, request);
	const drawingIds = found.map((f) => f.id);
	const counts = emptyCounts();
	let pinsToReview = 0;
	if (drawingIds.length > 0) {
		const rows = db
			.select({ state: j.state, n: count() })
			.from(j)
			.where(
				and(
					inArray(j.drawingId, drawingIds),
					request.acceptedOnly ? inArray(j.state, [...COMPLETE_STATES]) : undefined
				)
			)
			.groupBy(j.state)
			.all();
		for (const row of rows) counts[row.state] = row.n;
		pinsToReview =
			db
				.select({ n: count() })
				.from(schema.pins)
				.innerJoin(r, eq(r.id, schema.pins.revisionId))
				.innerJoin(j, eq(j.id, schema.pins.jointId))
				.where(
					and(
						inArray(r.drawingId, drawingIds),
						eq(r.status, 'current'),
						eq(schema.pins.needsReview, true),
						ne(j.state, 'void')
					)
				)
				.get()?.n ?? 0;
	}
	const live = Object.entries(counts).reduce((sum, [s, n]) => (s === 'void' ? sum : sum + n), 0);
	const revisions = found.flatMap((f) => f.revisions);
	return {
		drawings: found.length,
		revisions: revisions.length,
		sheets: revisions.reduce((sum, rev) => sum + rev.sheets.length, 0),
		joints: counts,
		notAccepted: live - completeJoints(counts),
		pinsToReview
	};
}

/**
 * A digest of the project, scope and options: two requests for the same set get the same
 * key whatever order the drawings were chosen in.
 */
export function scopeKey(projectId: number, request: ExportRequest): string {
	const { scope } = request;
	const normal = {
		projectId,
		drawings: scope.drawings ? [...new Set(scope.drawings)].sort((a, b) => a - b) : null,
		area: scope.area ?? null,
		system: scope.system ?? null,
		all: scope.all ?? false,
		includeSuperseded: request.includeSuperseded,
		acceptedOnly: request.acceptedOnly
	};
	return crypto.createHash('sha256').update(JSON.stringify(normal)).digest('hex');
}

/** The systems / test packs named on the project's drawings, for the scope chooser. */
export function systems(projectId: number): string[] {
	return db
		.selectDistinct({ system: d.system })
		.from(d)
		.where(and(eq(d.projectId, projectId), ne(d.system, '')))
		.orderBy(asc(d.system))
		.all()
		.map((row) => row.system);
}

/** Every drawing of the project, number and title only, for choosing drawings by hand. */
export function choices(projectId: number) {
	return db
		.select({ id: d.id, number: d.number, title: d.title })
		.from(d)
		.where(eq(d.projectId, projectId))
		.orderBy(asc(d.number))
		.all();
}

/**
 * The time of the newest record behind the drawings in scope (a joint or pin changed, a weld or
 * an inspection recorded), in UTC milliseconds; null when they hold no joint. The set shows the
 * records as of then, and the value stays the same while they do not change.
 */
export function recordsAsOf(drawingIds: readonly number[]): number | null {
	if (drawingIds.length === 0) return null;
	const ids = `(${drawingIds.map(Number).join(',')})`;
	const row = db.$client
		.prepare(
			`select max(t) as t from (
				select max(j.updated_at) as t from joints j where j.drawing_id in ${ids}
				union all select max(p.updated_at) from pins p
					join joints j on j.id = p.joint_id where j.drawing_id in ${ids}
				union all select max(w.recorded_at) from welds w
					join joints j on j.id = w.joint_id where j.drawing_id in ${ids}
				union all select max(i.inspected_at) from inspections i
					join joints j on j.id = i.joint_id where j.drawing_id in ${ids}
			)`
		)
		.get() as { t: number | null };
	return row.t;
}
