/**
 * Weld numbers read from a revision's sheets, in the background after upload (or on demand):
 * the finder (sheet-text/finder.ts) runs once per revision, one revision at a time, and every
 * label it finds is kept in `sheet_suggestions`. A number not yet on the drawing is `open`: a
 * faint mark on the sheet that the user accepts (a joint and its pin) or dismisses.
 *
 * On a new revision the same reading carries the previous revision's pins with the matcher
 * (src/lib/revision-match.ts): a pin whose number is found in place stays and needs no review;
 * one found elsewhere goes there, flagged as moved; one not found stays, flagged for review.
 * For sheets without text the images around the pins are compared instead.
 */
import { and, asc, desc, eq, inArray, isNull, lt } from 'drizzle-orm';
import { db, schema } from './db';
import * as storage from './storage';
import * as events from './events';
import * as joints from './joints';
import { DomainError } from './errors';
import { findWeldNumbers, type SheetSuggestions } from './sheet-text/finder';
import { compareAroundPins } from './sheet-text/raster';
import { matchRevision, type FoundLabel, type RasterOutcome } from '$lib/revision-match';
import type { JointFields } from '$lib/schemas/joint';

const s = schema.sheetSuggestions;
const sr = schema.sheetReadings;
const r = schema.revisions;
const d = schema.drawings;
const p = schema.pins;
const j = schema.joints;

let chain: Promise<void> = Promise.resolve();
const pending = new Map<number, Promise<void>>();

/**
 * Read the revision's sheets for weld numbers after those queued before it. The promise
 * settles when this reading is done (it never rejects: a failure is kept on the reading).
 */
export function queue(revisionId: number): Promise<void> {
	try {
		return enqueue(revisionId);
	} catch (error) {
		// A stored revision stands without its reading: it can be asked for again.
		console.error(`Tacksheet: revision ${revisionId} was not queued for reading:`, error);
		return Promise.resolve();
	}
}

/** How long an upload answer waits for its reading, to give the carried pins' counts. */
export const UPLOAD_WAIT_MS = 20_000;

/** The counts of a revision's carried pins, once read; null while unknown. */
export function carried(revisionId: number) {
	const row = reading(revisionId);
	if (row?.status !== 'done') return { pinsMoved: null, pinsFlagged: null, pinsInPlace: null };
	return {
		pinsMoved: row.pinsMoved ?? 0,
		pinsFlagged: row.pinsFlagged ?? 0,
		pinsInPlace: row.pinsCarried ?? 0
	};
}

function enqueue(revisionId: number): Promise<void> {
	db.insert(sr)
		.values({ revisionId, status: 'queued' })
		.onConflictDoUpdate({
			target: sr.revisionId,
			set: { status: 'queued', error: null, queuedAt: Date.now(), finishedAt: null }
		})
		.run();
	const job = chain.then(() => read(revisionId)).catch(() => undefined);
	chain = job;
	pending.set(revisionId, job);
	void job.then(() => {
		if (pending.get(revisionId) === job) pending.delete(revisionId);
	});
	return job;
}

/** Settles when every reading queued so far is done. */
export function idle(): Promise<void> {
	return chain;
}

/** Waits up to `ms` for the revision's reading; true when it is done (or failed). */
export async function settle(revisionId: number, ms: number): Promise<boolean> {
	const job = pending.get(revisionId);
	if (!job) return true;
	let timer: ReturnType<typeof setTimeout> | undefined;
	const done = await Promise.race([
		job.then(() => true),
		new Promise<boolean>((resolve) => (timer = setTimeout(() => resolve(false), ms)))
	]);
	clearTimeout(timer);
	return done;
}

export function reading(revisionId: number) {
	return db.select().from(sr).where(eq(sr.revisionId, revisionId)).get();
}

function revisionRow(revisionId: number) {
	return db
		.select({
			id: r.id,
			drawingId: r.drawingId,
			projectId: d.projectId,
			fileKey: r.fileKey,
			status: r.status,
			rule: schema.projects.weldNumberRule
		})
		.from(r)
		.innerJoin(d, eq(d.id, r.drawingId))
		.innerJoin(schema.projects, eq(schema.projects.id, d.projectId))
		.where(eq(r.id, revisionId))
		.get();
}

/** Every label found on a revision, as the matcher takes them. */
function labelsOf(revisionId: number): FoundLabel[] {
	return db
		.select()
		.from(s)
		.where(eq(s.revisionId, revisionId))
		.all()
		.map((row) => ({
			number: row.number,
			pageIndex: row.pageIndex,
			x: row.x,
			y: row.y,
			target:
				row.targetX !== null && row.targetY !== null ? { x: row.targetX, y: row.targetY } : null
		}));
}

async function read(revisionId: number): Promise<void> {
	const revision = revisionRow(revisionId);
	if (!revision) return;
	db.update(sr).set({ status: 'reading' }).where(eq(sr.revisionId, revisionId)).run();
	const started = Date.now();
	try {
		const bytes = await storage.readAll(revision.fileKey);
		const found = await findWeldNumbers(bytes, revision.rule);
		const carry = await carryInput(revision, bytes, found);
		store(revision, found, carry, Date.now() - started);
		events.publish(revision.projectId, {
			type: 'suggestions',
			action: 'read',
			drawingId: revision.drawingId,
			revisionId
		});
	} catch (error) {
		db.update(sr)
			.set({
				status: 'failed',
				error: error instanceof Error ? error.message : String(error),
				finishedAt: Date.now(),
				readMs: Date.now() - started
			})
			.where(eq(sr.revisionId, revisionId))
			.run();
	}
}

/** The pins carried to this revision still waiting for their first judgement, and what to judge them by. */
async function carryInput(
	revision: NonNullable<ReturnType<typeof revisionRow>>,
	bytes: Uint8Array,
	found: SheetSuggestions
) {
	const previous = db
		.select({ id: r.id, fileKey: r.fileKey })
		.from(r)
		.where(and(eq(r.drawingId, revision.drawingId), lt(r.id, revision.id)))
		.orderBy(desc(r.id))
		.get();
	if (!previous) return null;
	const pins = db
		.select({ pinId: p.id, number: j.number, pageIndex: p.pageIndex, x: p.x, y: p.y })
		.from(p)
		.innerJoin(j, eq(j.id, p.jointId))
		.where(and(eq(p.revisionId, revision.id), eq(p.needsReview, true), isNull(p.reviewReason)))
		.orderBy(asc(p.id))
		.all();
	if (pins.length === 0) return null;
	const oldReading = reading(previous.id);
	const oldLabels =
		oldReading?.status === 'done' && oldReading.textLayer ? labelsOf(previous.id) : undefined;
	const newPages = found.pages.map((page) => ({
		pageIndex: page.pageIndex,
		width: Math.abs(page.view[2] - page.view[0]),
		height: Math.abs(page.view[3] - page.view[1]),
		textLayer: page.textLayer
	}));
	const textless = new Set(
		newPages.filter((page) => !page.textLayer).map((page) => page.pageIndex)
	);
	let raster: RasterOutcome[] | undefined;
	if (pins.some((pin) => textless.has(pin.pageIndex))) {
		const oldBytes = await storage.readAll(previous.fileKey);
		const onScans = pins.filter((pin) => textless.has(pin.pageIndex));
		const outcomes = await compareAroundPins(oldBytes, bytes, onScans);
		raster = pins.map((pin) => {
			const k = onScans.indexOf(pin);
			return k < 0 ? 'unknown' : outcomes[k];
		});
	}
	return matchRevision({ pins, oldLabels, newLabels: found.items, newPages, raster });
}

/** The reading's result written in one transaction: labels, carried pins, counts. */
function store(
	revision: NonNullable<ReturnType<typeof revisionRow>>,
	found: SheetSuggestions,
	carry: Awaited<ReturnType<typeof carryInput>>,
	readMs: number
) {
	return db.transaction((tx) => {
		const onDrawing = new Map(
			tx
				.select({ id: j.id, number: j.number })
				.from(j)
				.where(eq(j.drawingId, revision.drawingId))
				.all()
				.map((row) => [row.number.toUpperCase(), row.id])
		);
		const retired = new Set(
			tx
				.select({ key: schema.retiredWeldNumbers.key })
				.from(schema.retiredWeldNumbers)
				.where(eq(schema.retiredWeldNumbers.drawingId, revision.drawingId))
				.all()
				.map((row) => row.key)
		);
		// A number once dismissed on an earlier revision of the drawing is not offered again.
		const dismissed = new Set(
			tx
				.select({ number: s.number })
				.from(s)
				.innerJoin(r, eq(r.id, s.revisionId))
				.where(and(eq(r.drawingId, revision.drawingId), eq(s.status, 'dismissed')))
				.all()
				.map((row) => row.number.toUpperCase())
		);
		const kept = new Map(
			tx
				.select({ number: s.number, status: s.status })
				.from(s)
				.where(eq(s.revisionId, revision.id))
				.all()
				.map((row) => [row.number.toUpperCase(), row.status])
		);
		tx.delete(s)
			.where(and(eq(s.revisionId, revision.id), eq(s.status, 'open')))
			.run();
		for (const item of found.items) {
			const key = item.number.toUpperCase();
			const before = kept.get(key);
			if (before && before !== 'open') continue;
			const jointId = onDrawing.get(key);
			tx.insert(s)
				.values({
					revisionId: revision.id,
					pageIndex: item.pageIndex,
					number: item.number,
					x: item.x,
					y: item.y,
					targetX: item.target?.x ?? null,
					targetY: item.target?.y ?? null,
					status:
						jointId !== undefined
							? 'accepted'
							: dismissed.has(key) || retired.has(key)
								? 'dismissed'
								: 'open',
					jointId: jointId ?? null
				})
				.run();
		}
		if (carry) {
			const now = Date.now();
			for (const fate of carry.fates) {
				const set =
					fate.status === 'carried'
						? { needsReview: false, reviewReason: null }
						: fate.status === 'moved'
							? {
									needsReview: true,
									reviewReason: 'moved' as const,
									pageIndex: fate.pageIndex,
									x: fate.x,
									y: fate.y
								}
							: { needsReview: true, reviewReason: 'missing' as const };
				// Only a pin nobody has confirmed or moved since it was carried.
				tx.update(p)
					.set({ ...set, updatedAt: now })
					.where(and(eq(p.id, fate.pin.pinId), eq(p.needsReview, true), isNull(p.reviewReason)))
					.run();
			}
		}
		const counts = carry?.counts ?? null;
		tx.update(sr)
			.set({
				status: 'done',
				textLayer: found.textLayer,
				found: found.items.length,
				error: null,
				pinsCarried: counts?.carried ?? null,
				pinsMoved: counts?.moved ?? null,
				pinsFlagged: counts?.flagged ?? null,
				readMs,
				finishedAt: Date.now()
			})
			.where(eq(sr.revisionId, revision.id))
			.run();
		return counts;
	});
}

/** The numbers a drawing has used (its joints', void ones too, and retired ones), in capitals. */
function takenKeys(revisionId: number): Set<string> {
	const drawingId = db.select({ id: r.drawingId }).from(r).where(eq(r.id, revisionId)).get()?.id;
	if (drawingId === undefined) return new Set();
	return new Set(joints.usedNumbers(drawingId).map((n) => n.toUpperCase()));
}

/** What GET /api/revisions/{id}/suggestions answers: the open suggestions and the reading. */
export function suggestions(revisionId: number) {
	const state = reading(revisionId);
	// A number placed by hand since the reading is on the drawing: never suggested twice.
	const taken = takenKeys(revisionId);
	const items = db
		.select({
			number: s.number,
			pageIndex: s.pageIndex,
			x: s.x,
			y: s.y,
			targetX: s.targetX,
			targetY: s.targetY
		})
		.from(s)
		.where(and(eq(s.revisionId, revisionId), eq(s.status, 'open')))
		.orderBy(asc(s.pageIndex), desc(s.y), asc(s.x))
		.all()
		.filter((item) => !taken.has(item.number.toUpperCase()))
		.map(({ targetX, targetY, ...item }) => ({
			...item,
			target: targetX !== null && targetY !== null ? { x: targetX, y: targetY } : null
		}));
	return {
		status: state?.status ?? 'none',
		textLayer: state?.textLayer ?? null,
		/** Pins carried from the previous revision: in place, moved and flagged (null: none). */
		carried:
			state?.status === 'done' && state.pinsCarried !== null
				? {
						inPlace: state.pinsCarried,
						moved: state.pinsMoved ?? 0,
						flagged: state.pinsFlagged ?? 0
					}
				: null,
		items,
		error: state?.status === 'failed' ? 'The sheets could not be read for weld numbers.' : null
	};
}

function openOnes(revisionId: number, numbers: string[] | 'all') {
	const taken = takenKeys(revisionId);
	const open = db
		.select()
		.from(s)
		.where(and(eq(s.revisionId, revisionId), eq(s.status, 'open')))
		.orderBy(asc(s.pageIndex), desc(s.y), asc(s.x))
		.all()
		.filter((row) => !taken.has(row.number.toUpperCase()));
	if (numbers === 'all') return open;
	const byKey = new Map(open.map((row) => [row.number.toUpperCase(), row]));
	const missing = numbers.filter((n) => !byKey.has(n.trim().toUpperCase()));
	if (missing.length > 0)
		throw new DomainError(
			`No open suggestion ${missing.join(', ')} on this revision (already accepted, dismissed or never found). Reload the suggestions.`,
			409,
			'numbers'
		);
	return [...new Set(numbers.map((n) => n.trim().toUpperCase()))].map((k) => byKey.get(k)!);
}

/**
 * Accept suggestions: a joint with the suggested number and its pin at the weld the label
 * points at (else at the label), with the defaults given; all or nothing.
 */
export function accept(
	revisionId: number,
	numbers: string[] | 'all',
	defaults: Partial<JointFields>,
	userId: string
) {
	const revision = revisionRow(revisionId);
	if (!revision) throw new DomainError('There is no such revision.', 404);
	if (revision.status !== 'current')
		throw new DomainError('Suggestions are accepted on the current revision only.', 409);
	const made = db.transaction(() => {
		const rows = openOnes(revisionId, numbers);
		const field = revision.rule.fieldPrefix.toUpperCase();
		return rows.map((row) => {
			// A number with the field prefix is a field weld unless the defaults say otherwise.
			const location =
				defaults.location ??
				(field && row.number.toUpperCase().startsWith(field) ? 'field' : 'shop');
			const { joint, pin } = joints.place(
				{
					revisionId,
					pageIndex: row.pageIndex,
					x: row.targetX ?? row.x,
					y: row.targetY ?? row.y,
					number: row.number,
					joint: { ...defaults, location }
				},
				userId
			);
			db.update(s)
				.set({ status: 'accepted', jointId: joint.id, decidedBy: userId, decidedAt: Date.now() })
				.where(eq(s.id, row.id))
				.run();
			return { joint, pin };
		});
	});
	events.publish(revision.projectId, {
		type: 'suggestions',
		action: 'changed',
		drawingId: revision.drawingId,
		revisionId
	});
	return made;
}

/** Dismiss suggestions: they are no longer offered on this drawing. */
export function dismiss(revisionId: number, numbers: string[] | 'all', userId: string) {
	const revision = revisionRow(revisionId);
	if (!revision) throw new DomainError('There is no such revision.', 404);
	const count = db.transaction(() => {
		const rows = openOnes(revisionId, numbers);
		if (rows.length > 0)
			db.update(s)
				.set({ status: 'dismissed', decidedBy: userId, decidedAt: Date.now() })
				.where(
					inArray(
						s.id,
						rows.map((row) => row.id)
					)
				)
				.run();
		return rows.length;
	});
	events.publish(revision.projectId, {
		type: 'suggestions',
		action: 'changed',
		drawingId: revision.drawingId,
		revisionId
	});
	return count;
}
