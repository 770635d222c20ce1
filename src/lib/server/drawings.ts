/** The drawing register: drawings, their revisions and sheets, uploads and supersede. */
import { DomainError } from './errors';
import {
	and,
	asc,
	count,
	desc,
	eq,
	exists,
	inArray,
	ne,
	notInArray,
	or,
	sql,
	type SQL
} from 'drizzle-orm';
import { COMPLETE_STATES } from '$lib/joint-state';
import { db, schema } from './db';
import * as storage from './storage';
import * as audit from './audit';
import { inspectPdf } from './pdf-inspect';
import * as events from './events';
import * as tiles from './tiles';
import * as sheetReadings from './sheet-readings';
import type { StagedUpload } from './staged-uploads';
import { emptyCounts } from '$lib/state-counts';
import * as counting from './state-counts';
import type { z } from 'zod';
import type {
	DrawingListQuery,
	newDrawingSchema,
	newRevisionSchema,
	UpdateDrawing
} from '$lib/schemas/drawing';

const d = schema.drawings;
const r = schema.revisions;
const j = schema.joints;

const current = and(eq(r.drawingId, d.id), eq(r.status, 'current'));

/** Upload writes take the write lock at BEGIN, so their duplicate checks hold across processes. */
const IMMEDIATE = { behavior: 'immediate' } as const;

function liveJointsWhere(extra?: SQL) {
	return db
		.select({ one: sql`1` })
		.from(j)
		.where(and(eq(j.drawingId, d.id), ne(j.state, 'void'), extra));
}

function statusFilter(status: DrawingListQuery['status']): SQL | undefined {
	switch (status) {
		case 'open':
			return exists(liveJointsWhere(notInArray(j.state, [...COMPLETE_STATES])));
		case 'complete':
			return and(
				exists(liveJointsWhere()),
				sql`not ${exists(liveJointsWhere(notInArray(j.state, [...COMPLETE_STATES])))}`
			);
		case 'empty':
			return sql`not ${exists(liveJointsWhere())}`;
		case 'review':
			return exists(
				db
					.select({ one: sql`1` })
					.from(schema.pins)
					.innerJoin(r, eq(r.id, schema.pins.revisionId))
					.innerJoin(j, eq(j.id, schema.pins.jointId))
					.where(
						and(
							eq(r.drawingId, d.id),
							eq(r.status, 'current'),
							eq(schema.pins.needsReview, true),
							ne(j.state, 'void')
						)
					)
			);
		default:
			return undefined;
	}
}

/** One page of the register, filtered and sorted in SQL, with joints per state. */
export function list(projectId: number, query: DrawingListQuery) {
	const pattern = `%${query.q.replace(/[%_\\]/g, (c) => `\\${c}`)}%`;
	const where = and(
		eq(d.projectId, projectId),
		query.q
			? or(
					sql`${d.number} like ${pattern} escape '\\'`,
					sql`${d.title} like ${pattern} escape '\\'`
				)
			: undefined,
		query.kind ? eq(d.kind, query.kind) : undefined,
		query.area ? eq(d.area, query.area) : undefined,
		statusFilter(query.status)
	);
	const order = {
		number: d.number,
		title: d.title,
		kind: d.kind,
		area: d.area,
		revised: r.uploadedAt
	}[query.sort];
	const direction = query.dir === 'desc' ? desc : asc;
	const rows = db
		.select({
			id: d.id,
			number: d.number,
			title: d.title,
			kind: d.kind,
			line: d.line,
			area: d.area,
			system: d.system,
			revisionId: r.id,
			revision: r.label,
			issuedOn: r.issuedOn,
			uploadedAt: r.uploadedAt,
			pageCount: r.pageCount,
			sha256: r.sha256,
			revisionCount: sql<number>`(select count(*) from ${r} as older where older.drawing_id = ${d.id})`
		})
		.from(d)
		.leftJoin(r, current)
		.where(where)
		.orderBy(direction(order), asc(d.number))
		.limit(query.pageSize)
		.offset((query.page - 1) * query.pageSize)
		.all();
	const total = db.select({ n: count() }).from(d).leftJoin(r, current).where(where).get()?.n ?? 0;
	const counts = counting.byDrawing(rows.map((row) => row.id));
	return {
		items: rows.map((row) => ({ ...row, counts: counts.get(row.id) ?? emptyCounts() })),
		total,
		page: query.page,
		pageSize: query.pageSize
	};
}

export function areas(projectId: number): string[] {
	return db
		.selectDistinct({ area: d.area })
		.from(d)
		.where(and(eq(d.projectId, projectId), ne(d.area, '')))
		.orderBy(asc(d.area))
		.all()
		.map((row) => row.area);
}

/** The drawings of these ids in the project, by number: what a drawing picker shows as chosen. */
export function picked(projectId: number, ids: number[]) {
	if (ids.length === 0) return [];
	return db
		.select({ id: d.id, number: d.number, title: d.title })
		.from(d)
		.where(and(eq(d.projectId, projectId), inArray(d.id, ids)))
		.orderBy(asc(d.number))
		.all();
}

export function get(projectId: number, drawingId: number) {
	return db
		.select()
		.from(d)
		.where(and(eq(d.id, drawingId), eq(d.projectId, projectId)))
		.get();
}

/** What an edit of the register data may change, in the order the audit lists it. */
const REGISTER_FIELDS = ['number', 'title', 'kind', 'line', 'area', 'system'] as const;

/**
 * Change a drawing's register data (number, title, type, line, area, system), named by the
 * version the editor last saw: a stale one, or a number another drawing of the project has,
 * is refused with 409. Audited with the values before and after.
 */
export function update(projectId: number, drawingId: number, input: UpdateDrawing, userId: string) {
	const result = db.transaction((tx) => {
		const drawing = tx
			.select()
			.from(d)
			.where(and(eq(d.id, drawingId), eq(d.projectId, projectId)))
			.get();
		if (!drawing) throw new DomainError('There is no such drawing in this project.', 404);
		if (drawing.version !== input.version)
			throw new DomainError(
				`Someone else changed drawing ${drawing.number} since you opened it. Reload it and check before you save again.`,
				409,
				'version'
			);
		const changed = REGISTER_FIELDS.filter(
			(key) => input[key] !== undefined && input[key] !== drawing[key]
		);
		if (changed.length === 0) return { drawing, changed };
		if (input.number !== undefined && changed.includes('number')) {
			const clash = tx
				.select({ id: d.id, number: d.number })
				.from(d)
				.where(
					and(
						eq(d.projectId, projectId),
						sql`upper(${d.number}) = ${input.number.toUpperCase()}`,
						ne(d.id, drawingId)
					)
				)
				.get();
			if (clash)
				throw new DomainError(
					`Drawing number ${clash.number} is already registered in this project.`,
					409,
					'number'
				);
		}
		const values = Object.fromEntries(changed.map((key) => [key, input[key]]));
		const updated = tx
			.update(d)
			.set({ ...values, version: drawing.version + 1 })
			.where(eq(d.id, drawingId))
			.returning()
			.get();
		audit.record(
			{
				action: 'update',
				entity: 'drawing',
				entityId: drawingId,
				projectId,
				userId,
				before: Object.fromEntries(changed.map((key) => [key, drawing[key]])),
				after: values
			},
			tx
		);
		return { drawing: updated, changed };
	}, IMMEDIATE);
	if (result.changed.length > 0)
		events.publish(projectId, { type: 'drawing', action: 'updated', drawingId, by: userId });
	return result.drawing;
}

/** Every revision of a drawing, newest first, with who uploaded it. */
export function history(drawingId: number) {
	return db
		.select({
			id: r.id,
			label: r.label,
			status: r.status,
			note: r.note,
			issuedOn: r.issuedOn,
			uploadedAt: r.uploadedAt,
			supersededAt: r.supersededAt,
			pageCount: r.pageCount,
			bytes: r.bytes,
			sha256: r.sha256,
			fileName: r.fileName,
			uploadedBy: schema.users.name
		})
		.from(r)
		.leftJoin(schema.users, eq(schema.users.id, r.uploadedBy))
		.where(eq(r.drawingId, drawingId))
		.orderBy(desc(r.uploadedAt), desc(r.id))
		.all();
}

/** The revisions of several drawings at once, newest first, for the register's history rows. */
export function historyFor(drawingIds: number[]) {
	const result = new Map<
		number,
		{
			id: number;
			label: string;
			status: 'current' | 'superseded';
			issuedOn: string | null;
			note: string;
			uploadedAt: number;
		}[]
	>();
	if (drawingIds.length === 0) return result;
	const rows = db
		.select({
			drawingId: r.drawingId,
			id: r.id,
			label: r.label,
			status: r.status,
			issuedOn: r.issuedOn,
			note: r.note,
			uploadedAt: r.uploadedAt
		})
		.from(r)
		.where(inArray(r.drawingId, drawingIds))
		.orderBy(desc(r.uploadedAt), desc(r.id))
		.all();
	for (const { drawingId, ...rev } of rows)
		result.set(drawingId, [...(result.get(drawingId) ?? []), rev]);
	return result;
}

/** A revision with its sheets, as the viewer and the API show it. */
export function revision(revisionId: number) {
	const row = db
		.select({
			id: r.id,
			drawingId: r.drawingId,
			projectId: d.projectId,
			label: r.label,
			status: r.status,
			note: r.note,
			issuedOn: r.issuedOn,
			uploadedAt: r.uploadedAt,
			supersededAt: r.supersededAt,
			pageCount: r.pageCount,
			bytes: r.bytes,
			sha256: r.sha256,
			fileKey: r.fileKey,
			fileName: r.fileName
		})
		.from(r)
		.innerJoin(d, eq(d.id, r.drawingId))
		.where(eq(r.id, revisionId))
		.get();
	if (!row) return undefined;
	const pages = db
		.select({
			index: schema.pages.pageIndex,
			x0: schema.pages.x0,
			y0: schema.pages.y0,
			x1: schema.pages.x1,
			y1: schema.pages.y1,
			rotation: schema.pages.rotation
		})
		.from(schema.pages)
		.where(eq(schema.pages.revisionId, revisionId))
		.orderBy(asc(schema.pages.pageIndex))
		.all();
	return { ...row, pages: pages.map((p) => ({ ...p, width: p.x1 - p.x0, height: p.y1 - p.y0 })) };
}

export function currentRevisionId(drawingId: number): number | undefined {
	return db
		.select({ id: r.id })
		.from(r)
		.where(and(eq(r.drawingId, drawingId), eq(r.status, 'current')))
		.get()?.id;
}

/** The public shape of a revision in API answers. */
export function revisionJson(rev: NonNullable<ReturnType<typeof revision>>) {
	const { fileKey: _key, ...rest } = rev;
	return { ...rest, fileUrl: `/api/revisions/${rev.id}/file` };
}

// Uploads ---------------------------------------------------------------------------------

type NewDrawing = z.infer<typeof newDrawingSchema>;
type NewRevision = z.infer<typeof newRevisionSchema>;

/**
 * A unique index that refused a row another upload wrote first (a second server process):
 * the same 409 the checks give, never a 500.
 */
function asConflict(error: unknown): unknown {
	const code = (error as { code?: unknown } | null)?.code;
	if (typeof code === 'string' && code.startsWith('SQLITE_CONSTRAINT_UNIQUE'))
		return new DomainError(
			'Another upload registered the same drawing number or revision label first. Reload the register and check.',
			409
		);
	return error;
}

/** Refused uploads leave nothing behind: the staged file is removed on every failure path. */
async function checkedPdf(staged: StagedUpload) {
	const inspected = await inspectPdf(staged.tempPath);
	if (!inspected.ok) throw new DomainError(inspected.message, 422);
	return inspected;
}

function safeFileName(number: string, label: string): string {
	return `${number}_rev${label}.pdf`.replace(/[^A-Za-z0-9._-]+/g, '-');
}

function insertRevision(
	tx: Parameters<Parameters<typeof db.transaction>[0]>[0],
	drawingId: number,
	values: {
		label: string;
		note: string;
		issuedOn?: string | null;
		userId: string;
		key: string;
		number: string;
	},
	staged: StagedUpload,
	pdf: Awaited<ReturnType<typeof checkedPdf>>
) {
	const created = tx
		.insert(r)
		.values({
			drawingId,
			label: values.label,
			status: 'current',
			note: values.note,
			issuedOn: values.issuedOn ?? new Date().toISOString().slice(0, 10),
			fileKey: values.key,
			fileName: safeFileName(values.number, values.label),
			sha256: staged.sha256,
			bytes: staged.bytes,
			pageCount: pdf.pageCount,
			uploadedBy: values.userId
		})
		.returning()
		.get();
	for (const page of pdf.pages) {
		tx.insert(schema.pages)
			.values({
				revisionId: created.id,
				pageIndex: page.index,
				x0: page.x0,
				y0: page.y0,
				x1: page.x1,
				y1: page.y1,
				rotation: page.rotation
			})
			.run();
	}
	return created;
}

export async function create(
	projectId: number,
	input: NewDrawing,
	staged: StagedUpload,
	userId: string
) {
	const key = storage.newKey('revisions', '.pdf');
	try {
		if (
			db
				.select({ id: d.id })
				.from(d)
				.where(and(eq(d.projectId, projectId), eq(d.number, input.number)))
				.get()
		) {
			throw new DomainError(
				`Drawing ${input.number} is already registered. Upload the file as a new revision of it instead.`,
				409
			);
		}
		const pdf = await checkedPdf(staged);
		await storage.adopt(key, staged.tempPath);
		const stored = db.transaction((tx) => {
			// Checked again here: another upload of the same number may have landed while this
			// file was being read, and nothing else can run between this check and the insert.
			if (
				tx
					.select({ id: d.id })
					.from(d)
					.where(and(eq(d.projectId, projectId), eq(d.number, input.number)))
					.get()
			)
				throw new DomainError(
					`Drawing ${input.number} was registered meanwhile. Upload the file as a new revision of it instead.`,
					409
				);
			const drawing = tx
				.insert(d)
				.values({
					projectId,
					number: input.number,
					title: input.title,
					kind: input.kind,
					line: input.line,
					area: input.area,
					system: input.system
				})
				.returning()
				.get();
			const created = insertRevision(
				tx,
				drawing.id,
				{ label: input.revision, note: input.note, userId, key, number: input.number },
				staged,
				pdf
			);
			audit.record(
				{
					action: 'create',
					entity: 'drawing',
					entityId: drawing.id,
					projectId,
					userId,
					after: { number: drawing.number, revision: created.label, sha256: created.sha256 }
				},
				tx
			);
			return { drawing, revisionId: created.id };
		}, IMMEDIATE);
		tiles.queue(stored.revisionId);
		void sheetReadings.queue(stored.revisionId);
		return stored;
	} catch (error) {
		await storage.remove(key).catch(() => {});
		throw asConflict(error);
	} finally {
		await storage.removePath(staged.tempPath);
	}
}

/**
 * A new revision becomes current and the one before it is superseded (kept, viewable). Every
 * live joint's pin is carried to the new revision at the same PDF point, flagged for review:
 * the inspection history stays with the joint.
 */
export async function addRevision(
	projectId: number,
	drawingId: number,
	input: NewRevision,
	staged: StagedUpload,
	userId: string
) {
	const key = storage.newKey('revisions', '.pdf');
	try {
		const drawing = get(projectId, drawingId);
		if (!drawing) throw new DomainError('There is no such drawing in this project.', 404);
		const existing = history(drawingId);
		if (existing.some((rev) => rev.label === input.label)) {
			throw new DomainError(
				`Drawing ${drawing.number} already has a revision ${input.label}. Use the next label.`,
				409
			);
		}
		const same = existing.find((rev) => rev.sha256 === staged.sha256);
		if (same) {
			throw new DomainError(
				`This very file is already stored as revision ${same.label} of ${drawing.number}.`,
				409
			);
		}
		const pdf = await checkedPdf(staged);
		await storage.adopt(key, staged.tempPath);
		const result = db.transaction((tx) => {
			// Checked again here, where nothing else can run before the insert: another upload
			// of the same label or the same file may have landed while this one was being read.
			const clash = tx
				.select({ label: r.label, sha256: r.sha256 })
				.from(r)
				.where(
					and(eq(r.drawingId, drawingId), or(eq(r.label, input.label), eq(r.sha256, staged.sha256)))
				)
				.get();
			if (clash)
				throw new DomainError(
					clash.label === input.label
						? `Drawing ${drawing.number} already has a revision ${input.label}. Use the next label.`
						: `This very file is already stored as revision ${clash.label} of ${drawing.number}.`,
					409
				);
			const previous = tx
				.select()
				.from(r)
				.where(and(eq(r.drawingId, drawingId), eq(r.status, 'current')))
				.get();
			const now = Date.now();
			if (previous)
				tx.update(r)
					.set({ status: 'superseded', supersededAt: now })
					.where(eq(r.id, previous.id))
					.run();
			const created = insertRevision(
				tx,
				drawingId,
				{ label: input.label, note: input.note, userId, key, number: drawing.number },
				staged,
				pdf
			);
			let carried = 0;
			if (previous) {
				const pins = tx
					.select({
						jointId: schema.pins.jointId,
						pageIndex: schema.pins.pageIndex,
						x: schema.pins.x,
						y: schema.pins.y
					})
					.from(schema.pins)
					.innerJoin(j, eq(j.id, schema.pins.jointId))
					.where(and(eq(schema.pins.revisionId, previous.id), ne(j.state, 'void')))
					.all();
				for (const pin of pins) {
					// A sheet the new revision no longer has: keep the pin on its last sheet for review.
					const pageIndex = Math.min(pin.pageIndex, pdf.pageCount - 1);
					tx.insert(schema.pins)
						.values({
							...pin,
							pageIndex,
							revisionId: created.id,
							needsReview: true,
							createdBy: userId
						})
						.run();
				}
				carried = pins.length;
			}
			audit.record(
				{
					action: 'supersede',
					entity: 'drawing',
					entityId: drawingId,
					projectId,
					userId,
					before: previous ? { revision: previous.label } : null,
					after: { revision: created.label, sha256: created.sha256, pinsCarried: carried }
				},
				tx
			);
			return { revisionId: created.id, superseded: previous?.label ?? null, pinsCarried: carried };
		}, IMMEDIATE);
		tiles.queue(result.revisionId);
		void sheetReadings.queue(result.revisionId);
		events.publish(projectId, {
			type: 'revision',
			action: 'added',
			drawingId,
			revisionId: result.revisionId,
			by: userId
		});
		return result;
	} catch (error) {
		await storage.remove(key).catch(() => {});
		throw asConflict(error);
	} finally {
		await storage.removePath(staged.tempPath);
	}
}
