/**
 * Tile pyramids of drawing sheets. Each sheet of a stored revision is rendered once, in the
 * background, into image tiles at a few zoom levels (server/render-worker.mjs, one worker
 * thread working through a queue), so the viewer shows a sheet at once instead of waiting for
 * pdf.js to download, parse and draw it. Tiles are stored through the storage module, keyed
 * by revision (`tiles/{revisionId}/{page}/{level}/{col}_{row}.webp`); `sheet_tiles` records
 * what exists for each sheet.
 */
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { db, schema } from './db';
import * as storage from './storage';
import * as events from './events';
import type {
	PreparingRevision,
	SheetTiles,
	TileFormat,
	TileLevel,
	TileProgress
} from '$lib/sheet-tiles';

export const TILE_SIZE = 512;
const WORKER_FILE = path.resolve(process.cwd(), 'server/render-worker.mjs');

const t = schema.sheetTiles;
const r = schema.revisions;
const d = schema.drawings;

export const EXTENSIONS: Record<TileFormat, string> = { webp: 'webp', png: 'png', jpeg: 'jpg' };
export const CONTENT_TYPES: Record<TileFormat, string> = {
	webp: 'image/webp',
	png: 'image/png',
	jpeg: 'image/jpeg'
};

function folderOf(revisionId: number, pageIndex: number): string {
	return `tiles/${revisionId}/${pageIndex}`;
}

export function keyOf(
	revisionId: number,
	pageIndex: number,
	level: number,
	col: number,
	row: number,
	format: TileFormat
): string {
	return `${folderOf(revisionId, pageIndex)}/${level}/${col}_${row}.${EXTENSIONS[format]}`;
}

// The queue -------------------------------------------------------------------------------

/** What the worker reports about one sheet it has finished. */
interface Pyramid {
	width: number;
	height: number;
	tileSize: number;
	format: TileFormat;
	raster: boolean;
	levels: TileLevel[];
	tiles: number;
	bytes: number;
	ms: number;
}

type WorkerMessage =
	| { type: 'ready'; format: TileFormat }
	| { type: 'page-start'; jobId: number; page: number }
	| {
			type: 'tile';
			jobId: number;
			page: number;
			level: number;
			col: number;
			row: number;
			format: TileFormat;
			bytes: ArrayBuffer;
	  }
	| { type: 'page-done'; jobId: number; page: number; pyramid: Pyramid }
	| { type: 'page-failed'; jobId: number; page: number; message: string }
	| { type: 'job-done'; jobId: number }
	| { type: 'job-failed'; jobId: number; message: string };

interface Job {
	id: number;
	revisionId: number;
	projectId: number;
	drawingId: number;
	file: string;
	pages: number[];
	/** Pages the worker has reported on, done or failed. */
	finished: Set<number>;
	/** Tiles on their way to storage, awaited before their sheet counts as done. */
	writes: Promise<void>[];
}

interface Renderer {
	worker: Worker | null;
	waiting: Job[];
	active: Job | null;
	nextJobId: number;
	/** Messages from the worker, handled one after the other. */
	handling: Promise<void>;
	idle: (() => void)[];
}

const renderer = ((globalThis as { tacksheetRenderer?: Renderer }).tacksheetRenderer ??= {
	worker: null,
	waiting: [],
	active: null,
	nextJobId: 1,
	handling: Promise.resolve(),
	idle: []
});

function revisionFacts(revisionId: number) {
	return db
		.select({
			revisionId: r.id,
			projectId: d.projectId,
			drawingId: d.id,
			fileKey: r.fileKey,
			pageCount: r.pageCount
		})
		.from(r)
		.innerJoin(d, eq(d.id, r.drawingId))
		.where(eq(r.id, revisionId))
		.get();
}

function isHeld(revisionId: number): boolean {
	return (
		renderer.active?.revisionId === revisionId ||
		renderer.waiting.some((job) => job.revisionId === revisionId)
	);
}

/**
 * Queues the sheets of a stored revision for rendering (all of them, or the pages given).
 * Called when a revision is stored, and when one without tiles is first viewed; `first`
 * puts it ahead of the others (someone is looking at it).
 */
export function queue(revisionId: number, pages?: number[], first = false): void {
	try {
		enqueue(revisionId, pages, first);
	} catch (error) {
		// A stored revision stands without its tiles: the viewer uses pdf.js and queues again.
		console.error(`Tacksheet: the sheets of revision ${revisionId} were not queued:`, error);
	}
}

function enqueue(revisionId: number, pages: number[] | undefined, first: boolean): void {
	const facts = revisionFacts(revisionId);
	if (!facts) return;
	const wanted = (pages ?? Array.from({ length: facts.pageCount }, (_, i) => i)).filter(
		(page) => page >= 0 && page < facts.pageCount
	);
	if (wanted.length === 0) return;
	db.transaction((tx) => {
		for (const pageIndex of wanted) {
			tx.insert(t)
				.values({ revisionId, pageIndex, status: 'queued', tileSize: TILE_SIZE })
				.onConflictDoUpdate({
					target: [t.revisionId, t.pageIndex],
					set: {
						status: 'queued',
						error: null,
						queuedAt: Date.now(),
						finishedAt: null,
						width: null,
						height: null,
						levels: [],
						tiles: 0,
						bytes: 0,
						renderMs: null
					}
				})
				.run();
		}
	});
	const waiting = renderer.waiting.find((job) => job.revisionId === revisionId);
	if (waiting) {
		waiting.pages = [...new Set([...waiting.pages, ...wanted])].sort((a, b) => a - b);
		if (first) moveToFront(waiting);
	} else {
		const job: Job = {
			id: renderer.nextJobId++,
			revisionId,
			projectId: facts.projectId,
			drawingId: facts.drawingId,
			file: storage.pathOf(facts.fileKey),
			pages: wanted,
			finished: new Set(),
			writes: []
		};
		if (first) renderer.waiting.unshift(job);
		else renderer.waiting.push(job);
	}
	tell(revisionId);
	pump();
}

/**
 * A revision is being viewed: its sheets go ahead of the queue; those that have no tiles yet
 * are queued, and so are those a stopped server left queued or half rendered. A failed sheet stays failed (the viewer uses pdf.js);
 * `npm run tiles:backfill -- --retry` tries those again.
 */
export function ensure(revisionId: number): void {
	const facts = revisionFacts(revisionId);
	if (!facts) return;
	const rows = db
		.select({ pageIndex: t.pageIndex, status: t.status })
		.from(t)
		.where(eq(t.revisionId, revisionId))
		.all();
	const known = new Map(rows.map((row) => [row.pageIndex, row.status]));
	const held = isHeld(revisionId);
	const missing: number[] = [];
	for (let page = 0; page < facts.pageCount; page++) {
		const status = known.get(page);
		if (status === undefined) missing.push(page);
		else if ((status === 'queued' || status === 'rendering') && !held) missing.push(page);
	}
	if (missing.length > 0) queue(revisionId, missing, true);
	else {
		const waiting = renderer.waiting.find((job) => job.revisionId === revisionId);
		if (waiting) moveToFront(waiting);
	}
}

function moveToFront(job: Job): void {
	renderer.waiting.splice(renderer.waiting.indexOf(job), 1);
	renderer.waiting.unshift(job);
}

/** Resolves when every queued sheet has been rendered (or has failed). */
export function idle(): Promise<void> {
	if (!renderer.active && renderer.waiting.length === 0) return Promise.resolve();
	return new Promise((resolve) => renderer.idle.push(resolve));
}

function startWorker(): Worker {
	const worker = new Worker(WORKER_FILE);
	worker.on('message', (message: WorkerMessage) => {
		renderer.handling = renderer.handling.then(() => handle(message)).catch(() => {});
	});
	const stopped = (reason: string) => {
		if (renderer.worker !== worker) return;
		renderer.worker = null;
		renderer.handling = renderer.handling.then(() => {
			const job = renderer.active;
			if (job) failRest(job, `The sheet renderer stopped (${reason}).`);
		});
	};
	worker.on('error', (error) => stopped(error.message));
	worker.on('exit', (code) => stopped(`exit code ${code}`));
	return worker;
}

function pump(): void {
	if (renderer.active) return;
	const job = renderer.waiting.shift();
	if (!job) {
		renderer.worker?.unref();
		for (const resolve of renderer.idle.splice(0)) resolve();
		return;
	}
	renderer.active = job;
	renderer.worker ??= startWorker();
	// Held while it works, so a script waiting for the queue does not exit under it.
	renderer.worker.ref();
	renderer.handling = renderer.handling.then(async () => {
		await Promise.all(job.pages.map((page) => storage.removeTree(folderOf(job.revisionId, page))));
		renderer.worker?.postMessage({
			type: 'render',
			jobId: job.id,
			file: job.file,
			pages: job.pages,
			tileSize: TILE_SIZE
		});
	});
}

function setRow(job: Job, pageIndex: number, values: Partial<typeof t.$inferInsert>): void {
	db.update(t)
		.set(values)
		.where(and(eq(t.revisionId, job.revisionId), eq(t.pageIndex, pageIndex)))
		.run();
}

function finish(job: Job): void {
	if (renderer.active !== job) return;
	renderer.active = null;
	pump();
}

/** Marks every page the worker did not finish as failed, and moves on to the next job. */
function failRest(job: Job, message: string): void {
	const left = job.pages.filter((page) => !job.finished.has(page));
	for (const page of left) {
		job.finished.add(page);
		setRow(job, page, { status: 'failed', error: message, finishedAt: Date.now() });
	}
	if (left.length > 0) tell(job.revisionId);
	finish(job);
}

async function handle(message: WorkerMessage): Promise<void> {
	const job = renderer.active;
	if (message.type === 'ready' || !job || message.jobId !== job.id) return;
	switch (message.type) {
		case 'page-start':
			setRow(job, message.page, { status: 'rendering' });
			tell(job.revisionId);
			return;
		case 'tile': {
			const { page, level, col, row, format, bytes } = message;
			job.writes.push(
				storage.put(keyOf(job.revisionId, page, level, col, row, format), new Uint8Array(bytes))
			);
			return;
		}
		case 'page-done': {
			const { page, pyramid } = message;
			const writes = job.writes.splice(0);
			try {
				await Promise.all(writes);
				job.finished.add(page);
				setRow(job, page, {
					status: 'done',
					raster: pyramid.raster,
					format: pyramid.format,
					tileSize: pyramid.tileSize,
					width: pyramid.width,
					height: pyramid.height,
					levels: pyramid.levels,
					tiles: pyramid.tiles,
					bytes: pyramid.bytes,
					renderMs: pyramid.ms,
					error: null,
					finishedAt: Date.now()
				});
			} catch (error) {
				await storage.removeTree(folderOf(job.revisionId, page)).catch(() => {});
				job.finished.add(page);
				setRow(job, page, {
					status: 'failed',
					error: `The tiles could not be stored: ${(error as Error).message}`,
					finishedAt: Date.now()
				});
			}
			tell(job.revisionId);
			return;
		}
		case 'page-failed': {
			await Promise.allSettled(job.writes.splice(0));
			await storage.removeTree(folderOf(job.revisionId, message.page)).catch(() => {});
			job.finished.add(message.page);
			setRow(job, message.page, {
				status: 'failed',
				error: message.message,
				finishedAt: Date.now()
			});
			tell(job.revisionId);
			return;
		}
		case 'job-done':
			failRest(job, 'The sheet renderer did not report on this sheet.');
			return;
		case 'job-failed':
			failRest(job, `The file could not be opened for rendering: ${message.message}`);
			return;
	}
}

// Reading ---------------------------------------------------------------------------------

/** How far the sheets of a revision are, as the register and the upload page show it. */
function countsOf(revisionId: number) {
	return (
		db
			.select({
				total: sql<number>`count(*)`,
				done: sql<number>`sum(${t.status} = 'done')`,
				failed: sql<number>`sum(${t.status} = 'failed')`
			})
			.from(t)
			.where(eq(t.revisionId, revisionId))
			.get() ?? { total: 0, done: 0, failed: 0 }
	);
}

/** Tells everyone looking at the project how far a revision's sheets are. */
function tell(revisionId: number): void {
	const facts = revisionFacts(revisionId);
	if (!facts) return;
	const counts = countsOf(revisionId);
	events.publish(facts.projectId, {
		type: 'tiles',
		drawingId: facts.drawingId,
		revisionId,
		total: counts.total,
		done: counts.done ?? 0,
		failed: counts.failed ?? 0
	});
}

/** The pyramid of every sheet of a revision that has one, queued or done. */
export function index(revisionId: number): SheetTiles[] {
	return db
		.select()
		.from(t)
		.where(eq(t.revisionId, revisionId))
		.orderBy(asc(t.pageIndex))
		.all()
		.map((row) => ({
			pageIndex: row.pageIndex,
			status: row.status,
			raster: row.raster,
			format: row.format,
			tileSize: row.tileSize,
			width: row.status === 'done' ? row.width : null,
			height: row.status === 'done' ? row.height : null,
			levels: row.status === 'done' ? row.levels : [],
			tiles: row.tiles,
			bytes: row.bytes,
			renderMs: row.renderMs,
			error: row.error,
			version: row.status === 'done' ? row.finishedAt : null,
			url: `/api/revisions/${revisionId}/tiles/${row.pageIndex}`,
			extension: row.format ? EXTENSIONS[row.format] : null
		}));
}

/** One stored tile, or null when the sheet has no such tile (yet). */
export function tile(
	revisionId: number,
	pageIndex: number,
	level: number,
	col: number,
	row: number,
	extension: string
) {
	const sheet = db
		.select()
		.from(t)
		.where(and(eq(t.revisionId, revisionId), eq(t.pageIndex, pageIndex)))
		.get();
	if (!sheet || sheet.status !== 'done' || !sheet.format) return null;
	if (EXTENSIONS[sheet.format] !== extension) return null;
	const shape = sheet.levels[level];
	if (!shape || col >= shape.cols || row >= shape.rows) return null;
	return {
		key: keyOf(revisionId, pageIndex, level, col, row, sheet.format),
		contentType: CONTENT_TYPES[sheet.format],
		etag: `"${sheet.id}-${sheet.finishedAt}-${level}-${col}-${row}"`
	};
}

/**
 * The project's revisions whose sheets are being prepared, and current ones where a sheet
 * failed, with the sheets done so far: "Preparing sheets 3/12".
 */
export function progress(projectId: number): TileProgress {
	const open = db
		.selectDistinct({ revisionId: t.revisionId })
		.from(t)
		.where(inArray(t.status, ['queued', 'rendering', 'failed']))
		.all()
		.map((row) => row.revisionId);
	if (open.length === 0) return { preparing: [], failed: [], done: 0, total: 0 };
	const rows: PreparingRevision[] = db
		.select({
			revisionId: r.id,
			drawingId: d.id,
			number: d.number,
			label: r.label,
			status: r.status,
			total: sql<number>`count(*)`,
			done: sql<number>`coalesce(sum(${t.status} = 'done'), 0)`,
			failed: sql<number>`coalesce(sum(${t.status} = 'failed'), 0)`
		})
		.from(t)
		.innerJoin(r, eq(r.id, t.revisionId))
		.innerJoin(d, eq(d.id, r.drawingId))
		.where(and(inArray(t.revisionId, open), eq(d.projectId, projectId)))
		.groupBy(r.id)
		.orderBy(asc(d.number), asc(r.id))
		.all()
		.filter((row) => row.status === 'current' || row.done + row.failed < row.total)
		.map(({ status: _status, ...row }) => row);
	const preparing = rows.filter((row) => row.done + row.failed < row.total);
	return {
		preparing,
		failed: rows.filter((row) => row.failed > 0 && row.done + row.failed === row.total),
		done: preparing.reduce((n, row) => n + row.done + row.failed, 0),
		total: preparing.reduce((n, row) => n + row.total, 0)
	};
}

/** Revisions with a sheet that has no tiles (or, with `retry`, failed ones): for the backfill. */
export function missing(retry = false): number[] {
	const withRows = db
		.select({ revisionId: t.revisionId, pages: sql<number>`count(*)` })
		.from(t)
		.where(inArray(t.status, retry ? ['done'] : ['done', 'failed']))
		.groupBy(t.revisionId)
		.all();
	const complete = new Map(withRows.map((row) => [row.revisionId, row.pages]));
	return db
		.select({ id: r.id, pageCount: r.pageCount })
		.from(r)
		.orderBy(asc(r.id))
		.all()
		.filter((rev) => (complete.get(rev.id) ?? 0) < rev.pageCount)
		.map((rev) => rev.id);
}
