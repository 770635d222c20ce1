/**
 * Reads an uploaded PDF from disk with pdf.js to check it is a drawing that opens, and to
 * record each page's view box and rotation. pdf.js reads the file by ranges, so a 150 MB
 * drawing is never held in memory whole; and it runs on a worker thread
 * (`server/pdf-inspect-worker.mjs`), one file at a time, so walking the pages of a large file
 * never holds up anyone else's request. A file that takes longer than the time limit to check
 * is refused and the worker started afresh.
 */
import { statSync } from 'node:fs';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import { config } from './config';

export interface InspectedPage {
	index: number;
	/** CropBox ∩ MediaBox in PDF points, as pdf.js's page.view. */
	x0: number;
	y0: number;
	x1: number;
	y1: number;
	rotation: 0 | 90 | 180 | 270;
}

export type Inspection =
	| { ok: true; pageCount: number; pages: InspectedPage[] }
	| {
			ok: false;
			reason: 'encrypted' | 'damaged' | 'empty' | 'too-many-pages' | 'page-size' | 'timeout';
			message: string;
	  };

/**
 * The largest sheet side: 200 in (14,400 pt, about 5 m), the largest page PDF viewers handle
 * at a user unit of 1 (ISO 32000-1, Annex C.2); no drawing sheet comes near it.
 */
export const MAX_SIDE_PT = 14_400;
/** Only small files are looked at for blank pages: drawing each page costs time. */
const BLANK_CHECK = { bytes: 2 * 1024 * 1024, pages: 20 };

export interface InspectOptions {
	maxPages?: number;
	timeoutMs?: number;
}

interface Pending {
	id: number;
	job: object;
	timeoutMs: number;
	resolve: (inspection: Inspection) => void;
}

const queue: Pending[] = [];
let worker: Worker | null = null;
let running: (Pending & { timer: ReturnType<typeof setTimeout> }) | null = null;
let nextId = 1;

function startWorker(): Worker {
	const started = new Worker(path.resolve(process.cwd(), 'server/pdf-inspect-worker.mjs'));
	started.on('message', ({ id, result }: { id: number; result: Inspection }) => {
		if (running?.id !== id) return;
		finish(result);
	});
	started.on('error', (error) => {
		if (worker === started) worker = null;
		finish({
			ok: false,
			reason: 'damaged',
			message: `The PDF could not be checked (${error.message}). Export it again from the drawing system.`
		});
	});
	started.on('exit', () => {
		if (worker === started) worker = null;
	});
	return started;
}

function finish(result: Inspection): void {
	const done = running;
	if (!done) return;
	clearTimeout(done.timer);
	running = null;
	done.resolve(result);
	next();
}

function next(): void {
	if (running) return;
	const job = queue.shift();
	if (!job) {
		worker?.unref();
		return;
	}
	worker ??= startWorker();
	worker.ref();
	const current = worker;
	running = {
		...job,
		timer: setTimeout(() => {
			// A file that keeps the worker busy this long is refused; the next one gets a new worker.
			worker = null;
			void current.terminate();
			finish({
				ok: false,
				reason: 'timeout',
				message: `The PDF took more than ${Math.round(job.timeoutMs / 1000)} s to check, so it was refused. Export it again, or split it into smaller files.`
			});
		}, job.timeoutMs)
	};
	current.postMessage({ id: job.id, job: job.job });
}

export function inspectPdf(
	file: string,
	{
		maxPages = config.uploadMaxPages,
		timeoutMs = config.uploadCheckSeconds * 1000
	}: InspectOptions = {}
): Promise<Inspection> {
	return new Promise((resolve) => {
		queue.push({
			id: nextId++,
			job: {
				file,
				bytes: fileSize(file),
				maxPages,
				maxSidePt: MAX_SIDE_PT,
				blankCheckBytes: BLANK_CHECK.bytes,
				blankCheckPages: BLANK_CHECK.pages
			},
			timeoutMs,
			resolve
		});
		next();
	});
}

function fileSize(file: string): number {
	try {
		return statSync(file).size;
	} catch {
		return Infinity;
	}
}
