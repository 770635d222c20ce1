/**
 * Sheets are rendered once into a tile pyramid when a revision is stored, in the background:
 * the tiles put back together must be the page as poppler (an independent PDF renderer) draws
 * it at the same size, rotation and view box included; a scan is recognised and keeps its own
 * resolution; a file that cannot be rendered is marked failed; the queue reports progress.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import crypto from 'node:crypto';
import { eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { createCanvas, loadImage, type Canvas, type Image } from '@napi-rs/canvas';
import { PDFDocument, StandardFonts, degrees, rgb } from 'pdf-lib';
import { db, schema } from '$lib/server/db';
import { seedIfEmpty } from '$lib/server/demo/seed';
import * as drawings from '$lib/server/drawings';
import * as events from '$lib/server/events';
import * as storage from '$lib/server/storage';
import * as tiles from '$lib/server/tiles';
import { config } from '$lib/server/config';
import type { StagedUpload } from '$lib/server/staged-uploads';

async function staged(bytes: Uint8Array): Promise<StagedUpload> {
	const dir = path.join(config.uploadsDir, 'tmp');
	fs.mkdirSync(dir, { recursive: true });
	const tempPath = path.join(dir, `${crypto.randomUUID()}.part`);
	fs.writeFileSync(tempPath, bytes);
	return {
		tempPath,
		bytes: bytes.byteLength,
		sha256: crypto.createHash('sha256').update(bytes).digest('hex'),
		originalName: 'x.pdf',
		createdAt: Date.now()
	};
}

let doccon: string;
let lbm: number;
let serial = 0;

async function upload(bytes: Uint8Array) {
	serial += 1;
	const { revisionId } = await drawings.create(
		lbm,
		{
			number: `TILE-${serial}`,
			title: 'Tile test',
			kind: 'shop',
			revision: '0',
			note: '',
			line: '',
			area: '',
			system: ''
		},
		await staged(bytes),
		doccon
	);
	return revisionId;
}

/** A drawn sheet with marks in known places, on a view box that does not start at 0 0. */
async function markedSheet(rotate: 0 | 90): Promise<Uint8Array> {
	const pdf = await PDFDocument.create();
	const font = await pdf.embedFont(StandardFonts.HelveticaBold);
	const page = pdf.addPage([1300, 900]);
	page.setMediaBox(-40, -30, 1300, 900);
	page.setCropBox(0, 0, 1224, 792);
	page.setRotation(degrees(rotate));
	page.drawRectangle({
		x: 10,
		y: 10,
		width: 1204,
		height: 772,
		borderWidth: 3,
		borderColor: rgb(0, 0, 0)
	});
	page.drawRectangle({ x: 60, y: 640, width: 180, height: 90, color: rgb(0.1, 0.2, 0.7) });
	page.drawCircle({ x: 1000, y: 200, size: 60, color: rgb(0.8, 0.1, 0.1) });
	for (let x = 100; x < 1200; x += 100)
		page.drawLine({ start: { x, y: 20 }, end: { x, y: 772 }, thickness: 1.5 });
	page.drawText('SHEET 1 OF 1  W-12  W-13', { x: 300, y: 400, size: 40, font });
	return pdf.save();
}

/** A raster-only sheet: one greyscale image of `dpi` filling an A3 page, nothing else. */
async function scannedSheet(dpi: number): Promise<Uint8Array> {
	const width = Math.round((1190.55 / 72) * dpi);
	const height = Math.round((841.89 / 72) * dpi);
	const canvas = createCanvas(width, height);
	const context = canvas.getContext('2d');
	context.fillStyle = '#e8e8e8';
	context.fillRect(0, 0, width, height);
	context.fillStyle = '#202020';
	context.fillRect(width * 0.1, height * 0.1, width * 0.3, height * 0.05);
	const jpeg = await canvas.encode('jpeg', 80);
	const pdf = await PDFDocument.create();
	const page = pdf.addPage([1190.55, 841.89]);
	page.drawImage(await pdf.embedJpg(jpeg), { x: 0, y: 0, width: 1190.55, height: 841.89 });
	return pdf.save();
}

/** The tiles of one level put back together into one image. */
async function assemble(revisionId: number, level: number) {
	const sheet = tiles.index(revisionId)[0];
	const shape = sheet.levels[level];
	const canvas = createCanvas(shape.width, shape.height);
	const context = canvas.getContext('2d');
	for (let row = 0; row < shape.rows; row++) {
		for (let col = 0; col < shape.cols; col++) {
			const found = tiles.tile(revisionId, 0, level, col, row, sheet.extension!)!;
			const image = await loadImage(Buffer.from(await storage.readAll(found.key)));
			// Edge tiles are only as large as what is left of the level.
			expect(image.width).toBe(Math.min(sheet.tileSize, shape.width - col * sheet.tileSize));
			expect(image.height).toBe(Math.min(sheet.tileSize, shape.height - row * sheet.tileSize));
			context.drawImage(image, col * sheet.tileSize, row * sheet.tileSize);
		}
	}
	return { canvas, shape };
}

function hasPdftoppm(): boolean {
	try {
		execFileSync('pdftoppm', ['-v'], { stdio: 'ignore' });
		return true;
	} catch {
		return false;
	}
}

/** The page as poppler draws it at this many pixels per point (its own rotation and box). */
async function popplerImage(pdfBytes: Uint8Array, scale: number) {
	const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tacksheet-poppler-'));
	const file = path.join(dir, 'sheet.pdf');
	fs.writeFileSync(file, pdfBytes);
	execFileSync('pdftoppm', [
		'-png',
		'-singlefile',
		// The page's visible area, as pdf.js and the viewer take it (poppler's default is the MediaBox).
		'-cropbox',
		'-r',
		String(scale * 72),
		file,
		path.join(dir, 'out')
	]);
	const image = await loadImage(fs.readFileSync(path.join(dir, 'out.png')));
	fs.rmSync(dir, { recursive: true, force: true });
	return image;
}

/**
 * Mean absolute difference per channel (0–255) of two images of one size, over the pixels
 * where either has ink: the white paper would otherwise hide a misplaced drawing.
 */
function difference(a: Canvas, b: Image): number {
	const other = createCanvas(a.width, a.height);
	other.getContext('2d').drawImage(b, 0, 0, a.width, a.height);
	const x = a.getContext('2d').getImageData(0, 0, a.width, a.height).data;
	const y = other.getContext('2d').getImageData(0, 0, a.width, a.height).data;
	let sum = 0;
	let inked = 0;
	for (let i = 0; i < x.length; i += 4) {
		if (Math.min(x[i], x[i + 1], x[i + 2], y[i], y[i + 1], y[i + 2]) > 200) continue;
		inked++;
		sum += Math.abs(x[i] - y[i]) + Math.abs(x[i + 1] - y[i + 1]) + Math.abs(x[i + 2] - y[i + 2]);
	}
	return sum / (Math.max(1, inked) * 3);
}

beforeAll(async () => {
	await seedIfEmpty();
	doccon = db
		.select()
		.from(schema.users)
		.where(eq(schema.users.email, 'doccon@tacksheet.test'))
		.get()!.id;
	lbm = db.select().from(schema.projects).where(eq(schema.projects.code, 'LBM-20')).get()!.id;
}, 120_000);

describe('sheet tiles', () => {
	it('renders a stored revision into levels of tiles and tells the project how far it is', async () => {
		const told: { done: number; total: number; revisionId: number }[] = [];
		const stop = events.subscribe(lbm, (event) => {
			if (event.type === 'tiles') told.push(event);
		});
		const revisionId = await upload(await markedSheet(0));
		expect(tiles.progress(lbm).preparing.map((p) => p.revisionId)).toContain(revisionId);
		await tiles.idle();
		stop();

		const [sheet] = tiles.index(revisionId);
		expect(sheet.status).toBe('done');
		expect(sheet.raster).toBe(false);
		expect(['webp', 'png']).toContain(sheet.format);
		expect([sheet.width, sheet.height]).toEqual([1224, 792]);
		// Long sides 512, 1024, 2048 and 4096 px over the 1224 pt wide view box.
		expect(sheet.levels.map((l) => l.width)).toEqual([512, 1024, 2048, 4096]);
		for (const level of sheet.levels) {
			expect(level.height).toBe(Math.ceil(792 * level.scale - 1e-6));
			expect(level.cols).toBe(Math.ceil(level.width / sheet.tileSize));
		}
		expect(sheet.tiles).toBe(sheet.levels.reduce((n, l) => n + l.cols * l.rows, 0));
		expect(sheet.bytes).toBeGreaterThan(0);
		expect(sheet.renderMs).toBeGreaterThan(0);
		expect(told.filter((e) => e.revisionId === revisionId).at(-1)).toMatchObject({
			done: 1,
			total: 1
		});
		expect(tiles.progress(lbm).preparing.map((p) => p.revisionId)).not.toContain(revisionId);
	});

	for (const rotate of [0, 90] as const) {
		it.skipIf(!hasPdftoppm())(
			`tiles put together are the sheet as poppler draws it (/Rotate ${rotate}, offset view box)`,
			async () => {
				const bytes = await markedSheet(rotate);
				const revisionId = await upload(bytes);
				await tiles.idle();
				const { canvas, shape } = await assemble(revisionId, 2);
				expect(rotate === 90 ? shape.height : shape.width).toBe(2048);
				const poppler = await popplerImage(bytes, shape.scale);
				expect(Math.abs(poppler.width - shape.width)).toBeLessThanOrEqual(1);
				expect(Math.abs(poppler.height - shape.height)).toBeLessThanOrEqual(1);
				// Over inked pixels, anti-aliasing and WebP differ a little along every edge; the
				// same tiles moved by one pixel differ more (measured: 21–22 as rendered, 32–56
				// shifted by 1 px, 43–93 by 2 px; unrotated or mirrored far more).
				expect(difference(canvas, poppler)).toBeLessThan(27);
			},
			60_000
		);
	}

	it('knows a scan and keeps its own resolution as the finest level, in JPEG', async () => {
		const revisionId = await upload(await scannedSheet(150));
		await tiles.idle();
		const [sheet] = tiles.index(revisionId);
		expect(sheet.status).toBe('done');
		expect(sheet.raster).toBe(true);
		expect(sheet.format).toBe('jpeg');
		const finest = sheet.levels.at(-1)!;
		expect(finest.scale).toBeCloseTo(150 / 72, 2);
		expect(finest.width).toBe(Math.round((1190.55 / 72) * 150));
	}, 60_000);

	it('marks a sheet failed, with the reason, when its file cannot be rendered', async () => {
		const revisionId = await upload(await markedSheet(0));
		await tiles.idle();
		const revision = drawings.revision(revisionId)!;
		fs.writeFileSync(storage.pathOf(revision.fileKey), 'not a pdf any more');
		tiles.queue(revisionId);
		await tiles.idle();
		const [sheet] = tiles.index(revisionId);
		expect(sheet.status).toBe('failed');
		expect(sheet.error).toMatch(/could not be opened/);
		expect(sheet.levels).toEqual([]);
		expect(tiles.tile(revisionId, 0, 0, 0, 0, 'webp')).toBeNull();
		expect(tiles.progress(lbm).failed.map((f) => f.revisionId)).toContain(revisionId);
		// A failed sheet is not queued again by a view; the backfill's retry does that.
		tiles.ensure(revisionId);
		expect(tiles.index(revisionId)[0].status).toBe('failed');
		expect(tiles.missing(false)).not.toContain(revisionId);
		expect(tiles.missing(true)).toContain(revisionId);
	});

	it('queues sheets on first view, and those a stopped server left behind', async () => {
		const demo = db
			.select({ id: schema.revisions.id })
			.from(schema.revisions)
			.where(eq(schema.revisions.status, 'current'))
			.get()!.id;
		expect(tiles.index(demo)).toEqual([]);
		tiles.ensure(demo);
		expect(tiles.index(demo).every((s) => s.status === 'queued' || s.status === 'rendering')).toBe(
			true
		);
		await tiles.idle();
		expect(tiles.index(demo).every((s) => s.status === 'done')).toBe(true);

		// A row left "rendering" by a server that stopped is not held by this queue: queued again.
		db.update(schema.sheetTiles)
			.set({ status: 'rendering' })
			.where(eq(schema.sheetTiles.revisionId, demo))
			.run();
		tiles.ensure(demo);
		await tiles.idle();
		expect(tiles.index(demo).every((s) => s.status === 'done')).toBe(true);
	}, 60_000);

	it('renders a sheet someone is looking at ahead of the uploads waiting', async () => {
		const order: number[] = [];
		const stop = events.subscribe(lbm, (event) => {
			if (event.type === 'tiles' && event.done === event.total) order.push(event.revisionId);
		});
		const busy = await upload(await markedSheet(0));
		const waiting = await upload(await markedSheet(90));
		const viewed = await upload(await scannedSheet(100));
		tiles.ensure(viewed);
		await tiles.idle();
		stop();
		// The first was already being drawn; the viewed one overtakes the one still waiting.
		expect(order.filter((id) => [busy, waiting, viewed].includes(id))).toEqual([
			busy,
			viewed,
			waiting
		]);
	}, 60_000);

	it('refuses a tile that is out of range or of another format', async () => {
		const revisionId = await upload(await markedSheet(0));
		await tiles.idle();
		const [sheet] = tiles.index(revisionId);
		const ext = sheet.extension!;
		expect(tiles.tile(revisionId, 0, 0, 0, 0, ext)).not.toBeNull();
		expect(tiles.tile(revisionId, 0, 0, 1, 0, ext)).toBeNull();
		expect(tiles.tile(revisionId, 0, sheet.levels.length, 0, 0, ext)).toBeNull();
		expect(tiles.tile(revisionId, 1, 0, 0, 0, ext)).toBeNull();
		expect(tiles.tile(revisionId, 0, 0, 0, 0, 'gif')).toBeNull();
		const etag = tiles.tile(revisionId, 0, 1, 1, 1, ext)!.etag;
		expect(etag).not.toBe(tiles.tile(revisionId, 0, 1, 0, 1, ext)!.etag);
	});
});
