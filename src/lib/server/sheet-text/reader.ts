/**
 * The sheet reader's worker thread, seen from the app: pdf.js reads a PDF's text items and
 * line work (`readSheetGeometry`) or renders grey crops of a page (`renderSheetCrops`) in
 * `server/sheet-reader.worker.mjs`, so a dense sheet never stalls the server's other requests.
 *
 * One worker, one job at a time (jobs queue), started on first use and stopped after a quiet
 * spell. Pages come back one by one and the worker waits for each to be taken, so a 100-page
 * file holds one page's geometry in memory at a time. The worker's JavaScript heap is capped;
 * a file that would need more fails its own job and the next job gets a fresh worker.
 */
import path from 'node:path';
import { Worker } from 'node:worker_threads';

/** One text item as pdf.js reports it: `m` is its matrix in unrotated user space. */
export interface SheetText {
	s: string;
	m: number[];
	/** Advance along the baseline, in user-space points. */
	w: number;
	h: number;
	font: string;
}

/** A closed outline, `pts` a flat x y list along it (curves sampled, no repeated end point). */
export interface SheetShape {
	pts: number[];
	curves: number;
	corners: number;
	fill: boolean;
	stroke: boolean;
	/** Filled in a dark colour (a weld dot, an arrowhead), not paper white. */
	dark: boolean;
}

export interface SheetGeometry {
	pageIndex: number;
	/** pdf.js's page.view: [x0, y0, x1, y1] in points. */
	view: number[];
	/** Clockwise /Rotate, 0, 90, 180 or 270. */
	rotate: number;
	texts: SheetText[];
	shapes: SheetShape[];
	/** Straight pieces of every stroked path, flat: x0 y0 x1 y1 … */
	segments: number[];
	/** Bounding boxes of the images drawn on the page: [x0, y0, x1, y1]. */
	images: number[][];
	operators: number;
	/** The page had more line work than the reader keeps; the rest was dropped. */
	truncated: boolean;
}

export interface SheetCrop {
	width: number;
	height: number;
	/** One byte of grey per pixel, row by row, 255 white. */
	grey: Uint8Array;
	/** Pixels per point it was rendered at. */
	scale: number;
}

/** The reader could not read the file: damaged, locked, or too big for its memory. */
export class SheetReadError extends Error {
	constructor(
		message: string,
		readonly reason: 'damaged' | 'encrypted' | 'too-large' | 'timeout'
	) {
		super(message);
		this.name = 'SheetReadError';
	}
}

const WORKER_FILE = path.resolve(process.cwd(), 'server/sheet-reader.worker.mjs');
const IDLE_MS = 30_000;
const HEAP_MB = 768;

type Message =
	| { id: number; kind: 'page'; page: SheetGeometry }
	| { id: number; kind: 'done'; pageCount?: number; crops?: SheetCrop[] | null }
	| { id: number; kind: 'error'; name: string; message: string };

interface Job {
	id: number;
	worker: Worker;
	onMessage: (message: Message) => void;
	fail: (error: Error) => void;
}

let worker: Worker | null = null;
let current: Job | null = null;
let idleTimer: NodeJS.Timeout | undefined;
let queue: Promise<unknown> = Promise.resolve();
let nextId = 1;

function startWorker(): Worker {
	const started = new Worker(WORKER_FILE, {
		resourceLimits: { maxOldGenerationSizeMb: HEAP_MB }
	});
	started.unref();
	started.on('message', (message: Message) => {
		if (current && message.id === current.id) current.onMessage(message);
	});
	const lost = (error: Error) => {
		if (worker === started) worker = null;
		if (current?.worker === started) current.fail(error);
	};
	started.on('error', (error) =>
		lost(
			/heap|memory/i.test(error.message)
				? new SheetReadError(
						'The drawing needs more memory to read than a sheet may use.',
						'too-large'
					)
				: error
		)
	);
	started.on('exit', (code) => lost(new Error(`the sheet reader stopped (exit ${code})`)));
	return started;
}

function translate(name: string, message: string): Error {
	if (name === 'PasswordException')
		return new SheetReadError('The PDF is protected with a password.', 'encrypted');
	return new SheetReadError(`The PDF cannot be read (${message}).`, 'damaged');
}

/** Runs one job on the worker, after any job before it. */
function run<T>(
	post: (w: Worker, id: number) => void,
	onMessage: (message: Message, w: Worker, fail: (error: unknown) => void) => T | undefined,
	timeoutMs: number
): Promise<T> {
	const job = queue.then(
		() =>
			new Promise<T>((resolve, reject) => {
				clearTimeout(idleTimer);
				worker ??= startWorker();
				const w = worker;
				const id = nextId++;
				const timer = setTimeout(() => {
					finish();
					if (worker === w) worker = null;
					void w.terminate();
					reject(new SheetReadError('Reading the drawing took too long.', 'timeout'));
				}, timeoutMs);
				const finish = () => {
					clearTimeout(timer);
					current = null;
					idleTimer = setTimeout(() => {
						if (worker === w && !current) {
							worker = null;
							void w.terminate();
						}
					}, IDLE_MS);
					idleTimer.unref();
				};
				current = {
					id,
					worker: w,
					fail: (error) => {
						finish();
						reject(error);
					},
					onMessage: (message) => {
						if (message.kind === 'error') {
							finish();
							reject(translate(message.name, message.message));
							return;
						}
						// The worker waits for a page to be taken: after a failure, start afresh.
						const fail = (error: unknown) => {
							finish();
							if (worker === w) worker = null;
							void w.terminate();
							reject(error);
						};
						try {
							const result = onMessage(message, w, fail);
							if (message.kind === 'done') {
								finish();
								resolve(result as T);
							}
						} catch (error) {
							fail(error);
						}
					}
				};
				post(w, id);
			})
	);
	queue = job.catch(() => undefined);
	return job;
}

function copyOf(bytes: Uint8Array): ArrayBuffer {
	return bytes.slice().buffer as ArrayBuffer;
}

/**
 * Reads every page of a PDF; `onPage` gets each page's geometry in page order, and the next
 * page is read once it has returned (or its promise settled). Resolves with the page count.
 * Rejects with a SheetReadError for a file that cannot be read, or with onPage's error.
 */
export function readSheetGeometry(
	bytes: Uint8Array,
	onPage: (page: SheetGeometry) => void | Promise<void>,
	{ timeoutMs = 120_000 }: { timeoutMs?: number } = {}
): Promise<number> {
	return run<number>(
		(w, id) => {
			const data = copyOf(bytes);
			w.postMessage({ id, kind: 'read', data }, [data]);
		},
		(message, w, fail) => {
			if (message.kind === 'page') {
				Promise.resolve(onPage(message.page)).then(
					() => w.postMessage({ id: message.id, kind: 'next' }),
					fail
				);
				return undefined;
			}
			return message.kind === 'done' ? (message.pageCount ?? 0) : undefined;
		},
		timeoutMs
	);
}

/**
 * Grey crops of one page around `boxes` ([x0, y0, x1, y1] in PDF points), rendered at about
 * `pxPerPt` pixels per point. Null when the file has no such page.
 */
export function renderSheetCrops(
	bytes: Uint8Array,
	pageIndex: number,
	boxes: number[][],
	pxPerPt = 2,
	{ timeoutMs = 120_000 }: { timeoutMs?: number } = {}
): Promise<SheetCrop[] | null> {
	return run<SheetCrop[] | null>(
		(w, id) => {
			const data = copyOf(bytes);
			w.postMessage({ id, kind: 'crops', data, pageIndex, boxes, pxPerPt }, [data]);
		},
		(message) => (message.kind === 'done' ? (message.crops ?? null) : undefined),
		timeoutMs
	);
}
