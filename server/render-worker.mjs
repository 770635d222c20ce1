// Renders the sheets of a stored drawing revision into a pyramid of image tiles, in a worker
// thread so the server's event loop never waits on pdf.js or the image encoder. Plain ESM with
// only runtime dependencies, since it runs beside the build (src/lib/server/tiles.ts starts
// it and stores what it sends back).
//
// In:  { type: 'render', jobId, file, pages: number[], tileSize }
// Out: { type: 'page-start', jobId, page }
//      { type: 'tile', jobId, page, level, col, row, format, bytes: ArrayBuffer }  (transferred)
//      { type: 'page-done', jobId, page, pyramid }
//      { type: 'page-failed', jobId, page, message }
//      { type: 'job-done', jobId } | { type: 'job-failed', jobId, message }
import { parentPort } from 'node:worker_threads';
import { createRequire } from 'node:module';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { createCanvas } from '@napi-rs/canvas';

// Sheets are background work: the server's own threads get the processor first. On Linux a
// thread has its own nice value; elsewhere this does nothing.
try {
	const threadId = Number(fs.readlinkSync('/proc/thread-self').split('/').pop());
	if (threadId > 0) os.setPriority(threadId, 10);
} catch {
	// not Linux, or not allowed: render at normal priority
}

const require = createRequire(import.meta.url);
const pdfjsDir = path.dirname(require.resolve('pdfjs-dist/package.json'));
const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
const { OPS } = pdfjs;

/** pdf.js in Node wants file-system folders ending in a separator (not file: URLs). */
const assets = (name) => path.join(pdfjsDir, name) + path.sep;

/** Long side of each vector level in pixels: a thumbnail, then twice as fine at every step. */
const VECTOR_LEVELS = [512, 1024, 2048, 4096];
/** A scan keeps its own resolution up to this long side; beyond it tiles outgrow their use. */
const MAX_SCAN_SIDE = 16384;
/**
 * Pixels rendered at once: a level larger than this is drawn in bands of whole tile rows. A
 * scan gets a larger budget, since pdf.js converts the whole image again for every band.
 */
const BAND_PIXELS = 16 * 1024 * 1024;
const SCAN_BAND_PIXELS = 48 * 1024 * 1024;
const WEBP_QUALITY = 82;
const JPEG_QUALITY = 80;

/** WebP where the canvas package can encode it, PNG otherwise. */
const format = (() => {
	try {
		return createCanvas(2, 2).encodeSync('webp', WEBP_QUALITY).length > 0 ? 'webp' : 'png';
	} catch {
		return 'png';
	}
})();

/** On this (lower priority) thread, not the shared pool the server's file work runs on. */
function encode(canvas, as) {
	if (as === 'jpeg') return canvas.encodeSync('jpeg', JPEG_QUALITY);
	return as === 'webp' ? canvas.encodeSync('webp', WEBP_QUALITY) : canvas.encodeSync('png');
}

function multiply(m, n) {
	return [
		m[0] * n[0] + m[2] * n[1],
		m[1] * n[0] + m[3] * n[1],
		m[0] * n[2] + m[2] * n[3],
		m[1] * n[2] + m[3] * n[3],
		m[0] * n[4] + m[2] * n[5] + m[4],
		m[1] * n[4] + m[3] * n[5] + m[5]
	];
}

const IMAGE_OPS = new Set([
	OPS.paintImageXObject,
	OPS.paintInlineImageXObject,
	OPS.paintImageXObjectRepeat
]);

/**
 * Whether a sheet is a scan: one or more images covering most of the page and next to no
 * vector drawing. Text may be present (a scanner's hidden OCR layer draws nothing visible).
 * Returns the scan's own resolution in pixels per PDF point, or null for a drawn sheet.
 */
async function scanResolution(page) {
	const { fnArray, argsArray } = await page.getOperatorList();
	let ctm = [1, 0, 0, 1, 0, 0];
	const stack = [];
	let paths = 0;
	let imageArea = 0;
	let imagePixels = 0;
	for (let i = 0; i < fnArray.length; i++) {
		const op = fnArray[i];
		const args = argsArray[i];
		if (op === OPS.save) stack.push(ctm);
		else if (op === OPS.restore) ctm = stack.pop() ?? ctm;
		else if (op === OPS.transform) ctm = multiply(ctm, args);
		else if (op === OPS.paintFormXObjectBegin) {
			stack.push(ctm);
			if (args?.[0]) ctm = multiply(ctm, args[0]);
		} else if (op === OPS.paintFormXObjectEnd) ctm = stack.pop() ?? ctm;
		else if (op === OPS.constructPath) paths++;
		else if (IMAGE_OPS.has(op)) {
			const width = Number(args?.[1]) || 0;
			const height = Number(args?.[2]) || 0;
			imageArea += Math.abs(ctm[0] * ctm[3] - ctm[1] * ctm[2]);
			imagePixels += width * height;
		}
	}
	const [x0, y0, x1, y1] = page.view;
	const pageArea = Math.abs((x1 - x0) * (y1 - y0));
	const scanned = imagePixels >= 1_000_000 && imageArea >= pageArea * 0.5 && paths <= 40;
	return scanned ? Math.sqrt(imagePixels / imageArea) : null;
}

/** The long sides of the levels of one sheet, smallest first. */
function levelSides(longSide, scanScale) {
	if (scanScale === null) return VECTOR_LEVELS;
	const native = Math.min(MAX_SCAN_SIDE, Math.max(2048, Math.round(longSide * scanScale)));
	const sides = [];
	for (let side = 512; side * 1.25 < native; side *= 2) sides.push(side);
	sides.push(native);
	return sides;
}

/** Cuts one rendered band of a level into tiles and sends each one as it is encoded. */
async function sendTiles(band, top, level, plan, sheetFormat, send) {
	const context = band.getContext('2d');
	const { tileSize, width, height, cols, rows } = plan;
	const firstRow = top / tileSize;
	const lastRow = Math.min(rows, firstRow + Math.ceil(band.height / tileSize));
	for (let row = firstRow; row < lastRow; row++) {
		const y = row * tileSize;
		const h = Math.min(tileSize, height - y);
		for (let col = 0; col < cols; col++) {
			const x = col * tileSize;
			const w = Math.min(tileSize, width - x);
			// getImageData + putImageData: drawImage from a big canvas copies the whole source
			// on every call.
			const tile = plan.tileCanvas(w, h);
			tile.getContext('2d').putImageData(context.getImageData(x, y - top, w, h), 0, 0);
			send(level, col, row, encode(tile, sheetFormat));
		}
	}
}

async function renderPage(doc, jobId, pageIndex, tileSize) {
	const page = await doc.getPage(pageIndex + 1);
	const started = performance.now();
	try {
		const sheet = page.getViewport({ scale: 1, rotation: page.rotate });
		const scanScale = await scanResolution(page);
		const raster = scanScale !== null;
		// A scan is a photograph of paper: JPEG encodes it ten times faster than WebP at the
		// same size. Line work on white stays WebP, which keeps thin lines clean.
		const sheetFormat = raster ? 'jpeg' : format;
		const longSide = Math.max(sheet.width, sheet.height);
		const sides = levelSides(longSide, scanScale);
		const levels = new Array(sides.length);
		let tiles = 0;
		let bytes = 0;
		const send = (level, col, row, encoded) => {
			const copy = new Uint8Array(encoded).buffer;
			tiles++;
			bytes += copy.byteLength;
			parentPort.postMessage(
				{ type: 'tile', jobId, page: pageIndex, level, col, row, format: sheetFormat, bytes: copy },
				[copy]
			);
		};
		const tileCanvases = new Map();
		const tileCanvas = (w, h) => {
			const key = `${w}x${h}`;
			let canvas = tileCanvases.get(key);
			if (!canvas) tileCanvases.set(key, (canvas = createCanvas(w, h)));
			return canvas;
		};
		/** The finer level just made, kept whole when it fitted one band (scans scale from it). */
		let finer = null;
		for (let level = sides.length - 1; level >= 0; level--) {
			const scale = sides[level] / longSide;
			const width = Math.max(1, Math.ceil(sheet.width * scale - 1e-6));
			const height = Math.max(1, Math.ceil(sheet.height * scale - 1e-6));
			const cols = Math.ceil(width / tileSize);
			const rows = Math.ceil(height / tileSize);
			const plan = { tileSize, width, height, cols, rows, tileCanvas };
			const budget = raster ? SCAN_BAND_PIXELS : BAND_PIXELS;
			const bandRows = Math.max(1, Math.min(rows, Math.floor(budget / (width * tileSize))));
			const band = createCanvas(width, Math.min(height, bandRows * tileSize));
			const context = band.getContext('2d');
			if (raster && finer) {
				// Halving a scan already drawn is one smooth resample; pdf.js would decode and
				// scale the whole image again.
				context.imageSmoothingEnabled = true;
				context.imageSmoothingQuality = 'high';
				context.fillStyle = '#ffffff';
				context.fillRect(0, 0, width, height);
				const ratio = scale / finer.scale;
				context.drawImage(
					finer.canvas,
					0,
					0,
					finer.canvas.width,
					finer.canvas.height,
					0,
					0,
					finer.canvas.width * ratio,
					finer.canvas.height * ratio
				);
				await sendTiles(band, 0, level, plan, sheetFormat, send);
			} else {
				const viewport = page.getViewport({ scale, rotation: page.rotate });
				for (let firstRow = 0; firstRow < rows; firstRow += bandRows) {
					const top = firstRow * tileSize;
					context.setTransform(1, 0, 0, 1, 0, 0);
					context.fillStyle = '#ffffff';
					context.fillRect(0, 0, band.width, band.height);
					await page.render({
						canvas: band,
						canvasContext: context,
						viewport,
						transform: [1, 0, 0, 1, 0, -top]
					}).promise;
					await sendTiles(band, top, level, plan, sheetFormat, send);
				}
			}
			if (finer) {
				finer.canvas.width = 0;
				finer.canvas.height = 0;
			}
			finer = bandRows >= rows ? { canvas: band, scale } : null;
			if (!finer) {
				band.width = 0;
				band.height = 0;
			}
			levels[level] = { scale, width, height, cols, rows };
		}
		if (finer) {
			finer.canvas.width = 0;
			finer.canvas.height = 0;
		}
		return {
			width: sheet.width,
			height: sheet.height,
			tileSize,
			format: sheetFormat,
			raster,
			levels,
			tiles,
			bytes,
			ms: Math.round(performance.now() - started)
		};
	} finally {
		page.cleanup();
	}
}

async function render({ jobId, file, pages, tileSize }) {
	let doc;
	try {
		doc = await pdfjs.getDocument({
			url: pathToFileURL(file).href,
			disableAutoFetch: true,
			disableStream: true,
			isEvalSupported: false,
			standardFontDataUrl: assets('standard_fonts'),
			cMapUrl: assets('cmaps'),
			cMapPacked: true,
			wasmUrl: assets('wasm'),
			iccUrl: assets('iccs'),
			verbosity: 0
		}).promise;
	} catch (error) {
		parentPort.postMessage({ type: 'job-failed', jobId, message: describe(error) });
		return;
	}
	try {
		for (const pageIndex of pages) {
			parentPort.postMessage({ type: 'page-start', jobId, page: pageIndex });
			try {
				const pyramid = await renderPage(doc, jobId, pageIndex, tileSize);
				parentPort.postMessage({ type: 'page-done', jobId, page: pageIndex, pyramid });
			} catch (error) {
				parentPort.postMessage({
					type: 'page-failed',
					jobId,
					page: pageIndex,
					message: describe(error)
				});
			}
		}
		parentPort.postMessage({ type: 'job-done', jobId });
	} finally {
		await doc.destroy();
	}
}

function describe(error) {
	return error instanceof Error ? `${error.name}: ${error.message}` : String(error);
}

/** One job at a time, in the order they arrive. */
let chain = Promise.resolve();
parentPort.on('message', (message) => {
	if (message?.type !== 'render') return;
	chain = chain.then(() => render(message));
});
parentPort.postMessage({ type: 'ready', format });
