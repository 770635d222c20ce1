// The first sheet a site tablet sees (1024×768, 2× pixel ratio), for the largest demo sheet
// (an A1 vector drawing) and for a 200-dpi scan of it made here: both are uploaded as new
// drawings, so their tiles are made the way every upload's are. For each, in headless
// Chromium over cold loads: "first visible" is the moment every tile of one level covering the
// whole sheet has been painted (Element Timing, so the page's HTML preview counts before its
// script runs), "full detail" the moment the view is at screen resolution (pdf.js's vector
// render of the visible part, or a scan's finer tiles). Full detail is set against the time poppler's
// pdftoppm takes to rasterise the same page at the same pixel size (raw PPM, no compression).
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium } from '@playwright/test';
import { percentile, startBenchServer } from './server.js';
import { signIn } from './session.js';
import { scanOf } from './scan-sheet.js';

const PORT = 4242;
const LOADS = 5;
const VIEWPORT = { width: 1024, height: 768 };
const PIXEL_RATIO = 2;
const FIRST_VISIBLE_GOAL_MS = 500;
const DETAIL_RATIO_GOAL = 2;

async function getJson(origin, cookie, url) {
	const response = await fetch(`${origin}${url}`, { headers: { cookie } });
	if (!response.ok) throw new Error(`GET ${url} answered ${response.status}`);
	return response.json();
}

/** Every current sheet of every project the user can see; the one with the largest area wins. */
async function largestSheet(origin, cookie) {
	let largest = null;
	for (const project of await getJson(origin, cookie, '/api/projects')) {
		const register = await getJson(
			origin,
			cookie,
			`/api/projects/${project.id}/drawings?pageSize=200`
		);
		for (const drawing of register.items) {
			if (!drawing.currentRevision) continue;
			const revision = await getJson(
				origin,
				cookie,
				`/api/revisions/${drawing.currentRevision.id}`
			);
			for (const page of revision.pages) {
				const area = page.width * page.height;
				if (largest && area <= largest.area) continue;
				largest = { area, page, projectId: project.id, number: drawing.number, revision };
			}
		}
	}
	if (!largest) throw new Error('the bench server has no drawings');
	return largest;
}

/** Uploads a PDF as a new drawing and waits for its tiles; the upload time is the start. */
async function uploadAndTile(origin, cookie, projectId, number, bytes) {
	const form = new FormData();
	form.set('number', number);
	form.set('title', 'Bench sheet');
	form.set('kind', 'structural');
	form.set('file', new Blob([bytes], { type: 'application/pdf' }), `${number}.pdf`);
	const response = await fetch(`${origin}/api/projects/${projectId}/drawings`, {
		method: 'POST',
		headers: { cookie, origin },
		body: form
	});
	const body = await response.json();
	if (response.status !== 201) throw new Error(`upload answered ${response.status}: ${body.error}`);
	const stored = performance.now();
	for (;;) {
		const [sheet] = (await getJson(origin, cookie, `/api/revisions/${body.revision.id}/tiles`))
			.items;
		if (sheet?.status === 'failed') throw new Error(`tiles failed: ${sheet.error}`);
		if (sheet?.status === 'done')
			return { drawingId: body.drawing.id, sheet, waitMs: performance.now() - stored };
		await new Promise((r) => setTimeout(r, 100));
	}
}

/** When every tile of some level was painted: the whole sheet on screen. */
function wholeSheetPainted(painted, sheet) {
	const byLevel = new Map();
	for (const [url, time] of painted) {
		const match = /\/tiles\/\d+\/(\d+)\/(\d+_\d+)\./.exec(url);
		if (!match) continue;
		const level = byLevel.get(match[1]) ?? new Map();
		level.set(match[2], Math.min(level.get(match[2]) ?? Infinity, time));
		byLevel.set(match[1], level);
	}
	let first = Infinity;
	for (const [level, tiles] of byLevel) {
		const shape = sheet.levels[Number(level)];
		if (tiles.size === shape.cols * shape.rows)
			first = Math.min(first, Math.max(...tiles.values()));
	}
	return first;
}

/** Cold loads of a drawing; the two moments read in the page's own clock (from navigation). */
async function coldLoads(browser, origin, cookies, href, sheet) {
	const visible = [];
	const detail = [];
	let sheetPixels = null;
	let source = null;
	for (let i = 0; i < LOADS; i++) {
		// A fresh context has an empty cache: every load fetches the app, the tiles and the PDF.
		const context = await browser.newContext({
			viewport: VIEWPORT,
			deviceScaleFactor: PIXEL_RATIO,
			hasTouch: true
		});
		await context.addCookies(cookies);
		await context.addInitScript(() => {
			window.__painted = [];
			new PerformanceObserver((list) => {
				for (const entry of list.getEntries())
					if (entry.identifier === 'sheet')
						window.__painted.push([entry.url, entry.renderTime || entry.loadTime]);
			}).observe({ type: 'element', buffered: true });
			new MutationObserver(() => {
				const viewer = document.querySelector('[data-testid=sheet-viewer]');
				if (!viewer) return;
				if (viewer.getAttribute('data-rendered-page') && window.__visibleMs === undefined)
					window.__visibleMs = performance.now();
				if (viewer.getAttribute('data-detail') === 'sharp' && window.__detailMs === undefined)
					window.__detailMs = performance.now();
			}).observe(document, { subtree: true, childList: true, attributes: true });
		});
		const page = await context.newPage();
		await page.goto(`${origin}${href}`, { waitUntil: 'commit' });
		await page.waitForSelector('[data-detail="sharp"]', { state: 'attached', timeout: 90_000 });
		const times = await page.evaluate(() => [window.__visibleMs, window.__detailMs]);
		const painted = await page.evaluate(() => window.__painted);
		visible.push(Math.min(times[0], wholeSheetPainted(painted, sheet)));
		detail.push(times[1]);
		// The sheet as fitted on screen, in device pixels: what full detail means here.
		sheetPixels ??= await page.evaluate((ratio) => {
			const sheet = document.querySelector('[data-testid=sheet-viewer] [data-testid=sheet]');
			const box = sheet.getBoundingClientRect();
			return { width: Math.round(box.width * ratio), height: Math.round(box.height * ratio) };
		}, PIXEL_RATIO);
		source ??= await page.getAttribute('[data-testid=sheet-viewer]', 'data-source');
		await context.close();
	}
	visible.sort((a, b) => a - b);
	detail.sort((a, b) => a - b);
	return { visible, detail, sheetPixels, source };
}

/** pdftoppm rasterising the page at a pixel size, median of three runs, process start included. */
function pdftoppmMs(file, { width, height }) {
	const times = [];
	const out = path.join(path.dirname(file), 'poppler');
	for (let i = 0; i < 3; i++) {
		const started = performance.now();
		execFileSync('pdftoppm', [
			'-cropbox',
			'-scale-to-x',
			String(width),
			'-scale-to-y',
			String(height),
			'-singlefile',
			file,
			out
		]);
		times.push(performance.now() - started);
	}
	return times.sort((a, b) => a - b)[1];
}

const mm = (points) => Math.round((points * 25.4) / 72);
const kb = (bytes) => `${(bytes / 1024).toFixed(0)} KB`;

export async function run() {
	const server = await startBenchServer({ port: PORT });
	const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tacksheet-bench-sheets-'));
	let browser = null;
	try {
		const reader = await signIn(server.origin, 'inspector@tacksheet.test');
		const doccon = await signIn(server.origin, 'doccon@tacksheet.test');
		const largest = await largestSheet(server.origin, reader);
		const pdfResponse = await fetch(`${server.origin}${largest.revision.fileUrl}`, {
			headers: { cookie: reader }
		});
		const vector = new Uint8Array(await pdfResponse.arrayBuffer());
		const scanStarted = performance.now();
		const scan = await scanOf(vector, 200);
		const scanMs = performance.now() - scanStarted;
		const size = `${mm(largest.page.width)} × ${mm(largest.page.height)} mm`;
		console.log(
			`sheets: ${largest.number} (${size}, vector, ${kb(vector.byteLength)}), and a 200-dpi scan of it made here (${scan.width} × ${scan.height} px JPEG in a raster-only PDF, ${kb(scan.bytes.byteLength)}, made in ${(scanMs / 1000).toFixed(1)} s)`
		);

		const cases = [
			{ label: 'A1 vector', number: 'BENCH-A1-VECTOR', bytes: vector },
			{ label: 'A1 200-dpi scan', number: 'BENCH-A1-SCAN', bytes: scan.bytes }
		];
		for (const c of cases) {
			const tiled = await uploadAndTile(
				server.origin,
				doccon,
				largest.projectId,
				c.number,
				c.bytes
			);
			c.href = `/projects/${largest.projectId}/drawings/${tiled.drawingId}`;
			c.sheet = tiled.sheet;
			c.file = path.join(dir, `${c.number}.pdf`);
			fs.writeFileSync(c.file, c.bytes);
			const { sheet } = tiled;
			const finest = sheet.levels.at(-1);
			console.log(
				`tiles at upload, ${c.label}: ${(sheet.renderMs / 1000).toFixed(1)} s in the render worker (ready ${(tiled.waitMs / 1000).toFixed(1)} s after the upload answered), ${sheet.tiles} ${sheet.format} tiles in ${sheet.levels.length} levels up to ${finest.width} × ${finest.height} px, ${kb(sheet.bytes)}${sheet.raster ? ', recognised as a scan' : ''}`
			);
		}

		// Other work on the machine slows a browser most of all: say how busy it was.
		const [load] = os.loadavg();
		console.log(
			`machine: ${os.cpus().length} cores, load average ${load.toFixed(1)} when the loads began`
		);
		browser = await chromium.launch({ executablePath: '/usr/bin/chromium', headless: true });
		const cookies = reader.split('; ').map((pair) => {
			const at = pair.indexOf('=');
			return { name: pair.slice(0, at), value: pair.slice(at + 1), url: server.origin };
		});
		for (const c of cases) {
			const loads = await coldLoads(browser, server.origin, cookies, c.href, c.sheet);
			const visible = percentile(loads.visible, 50);
			const detail = percentile(loads.detail, 50);
			const poppler = pdftoppmMs(c.file, loads.sheetPixels);
			const ratio = detail / poppler;
			console.log(
				`${c.label} at ${VIEWPORT.width}×${VIEWPORT.height}, ${PIXEL_RATIO}× (${LOADS} cold loads, shown from ${loads.source}): first visible median ${visible.toFixed(0)} ms (worst ${loads.visible.at(-1).toFixed(0)}), goal < ${FIRST_VISIBLE_GOAL_MS} ms: ${visible < FIRST_VISIBLE_GOAL_MS ? 'met' : 'MISSED'}`
			);
			console.log(
				`${c.label} full detail median ${detail.toFixed(0)} ms (worst ${loads.detail.at(-1).toFixed(0)}); pdftoppm at the same ${loads.sheetPixels.width} × ${loads.sheetPixels.height} px: ${poppler.toFixed(0)} ms; ratio ${ratio.toFixed(2)}, goal ≤ ${DETAIL_RATIO_GOAL}: ${ratio <= DETAIL_RATIO_GOAL ? 'met' : 'MISSED'}`
			);
		}
	} finally {
		await browser?.close();
		await server.stop();
		fs.rmSync(dir, { recursive: true, force: true });
	}
}
