/**
 * Sheets from tiles on a tablet at 2×: a drawn sheet shows its server-made tiles first and
 * then sharpens with pdf.js's vector render of the visible part; a scan is shown from its
 * tiles alone (its PDF is never fetched) and sharpens with finer tiles when zoomed in. Pins
 * and the scan's own marks stay on their PDF points over the tiles at two zooms.
 */
import { expect, test, type APIRequestContext, type Page } from '@playwright/test';
import { createCanvas, loadImage } from '@napi-rs/canvas';
import { PDFDocument, StandardFonts, degrees, rgb } from 'pdf-lib';
import { BASE_URL, signInInBrowser, signedInClient } from './support';

test.use({ deviceScaleFactor: 2 });

const A3 = { width: 1190.55, height: 841.89 };
/** Fine enough that zooming in on a tablet asks for a finer level than the fitted sheet. */
const SCAN_DPI = 300;
/**
 * Two marks on the scan, in image pixels at SCAN_DPI: a dot, and a square a pin is put on;
 * near enough the middle to stay in sight when the view zooms in at its centre.
 */
const DOT = { x: 2000, y: 1520, r: 60 };
const SQUARE = { x: 3120, y: 2100, half: 50 };

/** Image pixels of the scan (origin top left) → PDF points (origin bottom left). */
const scanPoint = (x: number, y: number): [number, number] => [
	(x / SCAN_DPI) * 72,
	A3.height - (y / SCAN_DPI) * 72
];

/** A raster-only A3 sheet: one greyish JPEG filling the page, with two dark marks. */
async function scanPdf(): Promise<Uint8Array> {
	const width = Math.round((A3.width / 72) * SCAN_DPI);
	const height = Math.round((A3.height / 72) * SCAN_DPI);
	const canvas = createCanvas(width, height);
	const context = canvas.getContext('2d');
	context.fillStyle = '#e6e6e2';
	context.fillRect(0, 0, width, height);
	context.strokeStyle = '#303030';
	context.lineWidth = 8;
	context.strokeRect(80, 80, width - 160, height - 160);
	context.fillStyle = '#101010';
	context.beginPath();
	context.arc(DOT.x, DOT.y, DOT.r, 0, Math.PI * 2);
	context.fill();
	context.fillRect(
		SQUARE.x - SQUARE.half,
		SQUARE.y - SQUARE.half,
		SQUARE.half * 2,
		SQUARE.half * 2
	);
	const pdf = await PDFDocument.create();
	const page = pdf.addPage([A3.width, A3.height]);
	page.drawImage(await pdf.embedJpg(await canvas.encode('jpeg', 85)), {
		x: 0,
		y: 0,
		width: A3.width,
		height: A3.height
	});
	return pdf.save();
}

/** A drawn A3 sheet turned by /Rotate 90, with a frame and some lettering. */
async function vectorPdf(): Promise<Uint8Array> {
	const pdf = await PDFDocument.create();
	const font = await pdf.embedFont(StandardFonts.Helvetica);
	const page = pdf.addPage([A3.height, A3.width]);
	page.setRotation(degrees(90));
	page.drawRectangle({
		x: 20,
		y: 20,
		width: A3.height - 40,
		height: A3.width - 40,
		borderWidth: 2,
		borderColor: rgb(0, 0, 0)
	});
	for (let y = 80; y < A3.width - 40; y += 60)
		page.drawText(`LINE 6"-P-11${y} WELD ${y / 20}`, { x: 60, y, size: 9, font });
	return pdf.save();
}

/** Uploads a drawing (or finds it, when a retry of these tests uploaded it already). */
async function upload(client: APIRequestContext, number: string, bytes: Uint8Array) {
	const known = (await (await client.get(`/api/projects/1/drawings?q=${number}`)).json()).items;
	if (known.length === 1)
		return { drawingId: known[0].id as number, revisionId: known[0].currentRevision.id as number };
	const response = await client.post('/api/projects/1/drawings', {
		multipart: {
			number,
			title: 'Tiled sheet',
			kind: 'isometric',
			file: { name: `${number}.pdf`, mimeType: 'application/pdf', buffer: Buffer.from(bytes) }
		},
		headers: { origin: BASE_URL }
	});
	expect(response.status()).toBe(201);
	const body = await response.json();
	await expect
		.poll(
			async () =>
				(await (await client.get(`/api/revisions/${body.revision.id}/tiles`)).json()).items[0]
					?.status,
			{ timeout: 60_000 }
		)
		.toBe('done');
	return { drawingId: body.drawing.id as number, revisionId: body.revision.id as number };
}

/** The values the viewer's data-detail takes, in order, and how many tiles were in at each. */
async function recordDetail(page: Page) {
	await page.addInitScript(() => {
		const seen: { detail: string; tiles: number; detailShown: boolean }[] = [];
		(window as unknown as { __detail: typeof seen }).__detail = seen;
		new MutationObserver(() => {
			const viewer = document.querySelector('[data-testid=sheet-viewer]');
			const detail = viewer?.getAttribute('data-detail');
			if (!detail || seen.at(-1)?.detail === detail) return;
			const tiles = [...document.querySelectorAll('[data-testid=sheet-tiles] img')].filter(
				(img) => (img as HTMLImageElement).complete && (img as HTMLImageElement).naturalWidth > 0
			).length;
			const canvas = document.querySelector('[data-testid=detail-canvas]') as HTMLElement | null;
			seen.push({ detail, tiles, detailShown: !!canvas && !canvas.hidden });
		}).observe(document, { subtree: true, attributes: true, childList: true });
	});
	return () =>
		page.evaluate(
			() =>
				(
					window as unknown as {
						__detail: { detail: string; tiles: number; detailShown: boolean }[];
					}
				).__detail
		);
}

/** PDF point → screen point, from the sheet's box on screen and its view box and rotation. */
async function screenPoint(
	page: Page,
	box: { x0: number; y0: number; x1: number; y1: number; rotation: number },
	x: number,
	y: number
) {
	const sheet = (await page.getByTestId('sheet').boundingBox())!;
	const w = box.x1 - box.x0;
	const h = box.y1 - box.y0;
	const turned = box.rotation === 90 || box.rotation === 270;
	const perUnit = sheet.width / (turned ? h : w);
	// Sheet units are the page with its rotation applied, y down; PDF space is unrotated, y up.
	const [u, v] =
		box.rotation === 90
			? [y - box.y0, x - box.x0]
			: box.rotation === 180
				? [box.x1 - x, y - box.y0]
				: box.rotation === 270
					? [box.y1 - y, box.x1 - x]
					: [x - box.x0, box.y1 - y];
	return [sheet.x + u * perUnit, sheet.y + v * perUnit] as const;
}

async function pinCentre(page: Page, number: string): Promise<[number, number]> {
	const b = (await page
		.locator(`[data-testid=pin][data-number="${number}"] circle`)
		.first()
		.boundingBox())!;
	return [b.x + b.width / 2, b.y + b.height / 2];
}

/** Lightness (0–255) of the screen around a point, from a screenshot. */
async function lightnessAt(page: Page, [x, y]: readonly [number, number]): Promise<number> {
	const shot = await page.screenshot({ clip: { x: x - 2, y: y - 2, width: 4, height: 4 } });
	const image = await loadImage(shot);
	const canvas = createCanvas(image.width, image.height);
	const context = canvas.getContext('2d');
	context.drawImage(image, 0, 0);
	const data = context.getImageData(0, 0, image.width, image.height).data;
	let sum = 0;
	for (let i = 0; i < data.length; i += 4) sum += (data[i] + data[i + 1] + data[i + 2]) / 3;
	return sum / (data.length / 4);
}

/** Four steps of 1.25 at the frame's centre: past the next level of tiles. */
async function zoomIn(page: Page) {
	const before = await page.getByTestId('zoom-level').textContent();
	for (let i = 0; i < 4; i++) await page.getByRole('button', { name: 'Zoom in' }).tap();
	await expect(page.getByTestId('zoom-level')).not.toHaveText(before ?? '');
}

let doccon: APIRequestContext;
let inspector: APIRequestContext;
let vector: { drawingId: number; revisionId: number };
let scan: { drawingId: number; revisionId: number };

test.beforeAll(async () => {
	test.setTimeout(180_000);
	doccon = await signedInClient('doccon@tacksheet.test');
	inspector = await signedInClient('inspector@tacksheet.test');
	vector = await upload(doccon, 'LBM-20-ISO-9501', await vectorPdf());
	scan = await upload(doccon, 'LBM-20-SCAN-9502', await scanPdf());
});
test.afterAll(async () => {
	await doccon.dispose();
	await inspector.dispose();
});

test('a drawn sheet shows its tiles first, then sharpens with the vector render', async ({
	page
}) => {
	const seen = await recordDetail(page);
	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible({ timeout: 20_000 });
	await page.goto(`/projects/1/drawings/${vector.drawingId}`);
	const viewer = page.getByTestId('sheet-viewer');
	await expect(viewer).toHaveAttribute('data-source', 'tiles');
	await expect(viewer).toHaveAttribute('data-rendered-page', '1');
	await expect(viewer).toHaveAttribute('data-detail', 'sharp');

	const steps = await seen();
	const preview = steps.findIndex((s) => s.detail === 'preview');
	const sharp = steps.findIndex((s) => s.detail === 'sharp');
	expect(preview, JSON.stringify(steps)).toBeGreaterThanOrEqual(0);
	expect(sharp).toBeGreaterThan(preview);
	// On screen from tiles while pdf.js had not drawn yet; then the vector render over them.
	expect(steps[preview].tiles).toBeGreaterThan(0);
	expect(steps[preview].detailShown).toBe(false);
	expect(steps[sharp].detailShown).toBe(true);
	const detail = page.getByTestId('detail-canvas');
	const perUnit = await detail.evaluate((element) => {
		const canvas = element as HTMLCanvasElement;
		return canvas.width / canvas.offsetWidth;
	});
	const zoom = Number.parseInt((await page.getByTestId('zoom-level').textContent()) ?? '', 10);
	// The vector render matches the screen: zoom (in CSS px per point) × the pixel ratio of 2.
	expect(perUnit / (((zoom / 100) * 96) / 72) / 2).toBeGreaterThan(0.9);
});

test('a scan is shown from its tiles alone, sharpens with finer tiles, and pins stay on their points', async ({
	page
}) => {
	const revision = await (await inspector.get(`/api/revisions/${scan.revisionId}`)).json();
	const box = revision.pages[0];
	const [px, py] = scanPoint(SQUARE.x, SQUARE.y);
	const placed = await inspector.post(`/api/revisions/${scan.revisionId}/pins`, {
		data: { pageIndex: 0, x: px, y: py, joint: {} },
		headers: { origin: BASE_URL }
	});
	expect(placed.status()).toBe(201);
	const number: string = (await placed.json()).joint.number;

	const fileRequests: string[] = [];
	page.on('request', (request) => {
		if (request.url().includes(`/api/revisions/${scan.revisionId}/file`))
			fileRequests.push(request.url());
	});
	const seen = await recordDetail(page);
	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible({ timeout: 20_000 });
	await page.goto(`/projects/1/drawings/${scan.drawingId}`);
	const viewer = page.getByTestId('sheet-viewer');
	await expect(viewer).toHaveAttribute('data-source', 'tiles');
	await expect(viewer).toHaveAttribute('data-detail', 'sharp');
	await expect(page.locator(`[data-testid=pin][data-number="${number}"]`)).toBeVisible();

	const tiles = page.getByTestId('sheet-tiles');
	for (const zoom of ['fitted', 'zoomed in']) {
		if (zoom === 'zoomed in') {
			const coarse = Number(await tiles.getAttribute('data-level'));
			await zoomIn(page);
			await expect
				.poll(async () => Number(await tiles.getAttribute('data-level')))
				.toBeGreaterThan(coarse);
			await expect(viewer).toHaveAttribute('data-detail', 'sharp');
		}
		// The scan's own dot, drawn into the tiles, is where its PDF point maps on screen.
		const dot = await screenPoint(page, box, ...scanPoint(DOT.x, DOT.y));
		expect(await lightnessAt(page, dot), `${zoom}: the dot under its point`).toBeLessThan(80);
		// And the paper beside it, two dot radii away, is not dark: the tiles are not smeared.
		const [bx, by] = await screenPoint(page, box, ...scanPoint(DOT.x + 2 * DOT.r, DOT.y));
		expect(await lightnessAt(page, [bx, by]), `${zoom}: paper beside the dot`).toBeGreaterThan(150);
		// The pin sits on its PDF point, on the square drawn there.
		const expected = await screenPoint(page, box, px, py);
		const [cx, cy] = await pinCentre(page, number);
		expect(Math.abs(cx - expected[0]), `${zoom}: pin x`).toBeLessThan(1.5);
		expect(Math.abs(cy - expected[1]), `${zoom}: pin y`).toBeLessThan(1.5);
	}

	const steps = await seen();
	// The sheet came in as a preview, then sharp; after the zoom the finer tiles end sharp again
	// (whether a preview shows between depends on how fast they arrive, so it is not asserted).
	const details = steps.map((s) => s.detail);
	expect(details.indexOf('preview'), details.join(' ')).toBeGreaterThanOrEqual(0);
	expect(details.indexOf('sharp')).toBeGreaterThan(details.indexOf('preview'));
	expect(details.at(-1)).toBe('sharp');
	// A scan is never handed to pdf.js: its PDF is not even fetched, and no vector render runs.
	expect(fileRequests).toEqual([]);
	await expect(page.getByTestId('detail-canvas')).toHaveCount(0);
});
