/**
 * Drawing sheets onto canvases. Sheet units are CSS pixels of the page viewport at scale 1
 * (one PDF point each, rotation applied), so the base canvas, the detail canvas and the SVG
 * overlay all share one coordinate system inside the panzoom element.
 */
import type { PDFPageProxy, PageViewport, RenderTask } from './pdf';

/** iOS Safari refuses canvases over 16.7 MP; other browsers cope, but memory on a tablet does not. */
export const MAX_CANVAS_PIXELS = 2 ** 24;
const MAX_CANVAS_SIDE = 16384;
/** Beyond 2 the extra pixels cost memory and time without a visible gain (pdf.js #17170). */
const MAX_DEVICE_PIXEL_RATIO = 2;
/** Extra area rendered around the visible part, so a short pan does not show the blurry base. */
const DETAIL_MARGIN = 0.15;

export interface SheetRegion {
	x: number;
	y: number;
	width: number;
	height: number;
}

export interface DetailPlan {
	region: SheetRegion;
	pixelRatio: number;
}

export function devicePixelRatioCapped(): number {
	return Math.min(MAX_DEVICE_PIXEL_RATIO, Math.max(1, window.devicePixelRatio || 1));
}

export function sheetViewport(page: PDFPageProxy): PageViewport {
	return page.getViewport({ scale: 1, rotation: page.rotate });
}

/** The canvas pixels per sheet unit for a whole sheet, kept inside the pixel budget. */
export function basePixelRatio(
	width: number,
	height: number,
	budget: number = MAX_CANVAS_PIXELS
): number {
	const byArea = Math.sqrt(budget / (width * height));
	const bySide = MAX_CANVAS_SIDE / Math.max(width, height);
	return Math.min(devicePixelRatioCapped(), byArea, bySide);
}

/**
 * The part of the sheet worth rendering again for the current pan and zoom, or null when the
 * base canvas already has about the right resolution. Zoomed in, the base is too coarse;
 * zoomed far out, a big base shrunk by the browser drops thin lines, so both get a detail
 * render at the resolution on screen. The region is snapped to whole canvas pixels so the
 * detail canvas lines up with the base without a half-pixel shimmer.
 */
export function planDetail(
	transform: { x: number; y: number; scale: number },
	frame: { width: number; height: number },
	sheet: { width: number; height: number },
	baseRatio: number
): DetailPlan | null {
	let pixelRatio = transform.scale * devicePixelRatioCapped();
	if (pixelRatio <= baseRatio * 1.1 && pixelRatio >= baseRatio * 0.75) return null;
	const visibleX0 = -transform.x / transform.scale;
	const visibleY0 = -transform.y / transform.scale;
	const visibleW = frame.width / transform.scale;
	const visibleH = frame.height / transform.scale;
	const x0 = Math.max(0, visibleX0 - visibleW * DETAIL_MARGIN);
	const y0 = Math.max(0, visibleY0 - visibleH * DETAIL_MARGIN);
	const x1 = Math.min(sheet.width, visibleX0 + visibleW * (1 + DETAIL_MARGIN));
	const y1 = Math.min(sheet.height, visibleY0 + visibleH * (1 + DETAIL_MARGIN));
	if (x1 <= x0 || y1 <= y0) return null;
	const area = (x1 - x0) * (y1 - y0);
	pixelRatio = Math.min(pixelRatio, Math.sqrt(MAX_CANVAS_PIXELS / area));
	const px0 = Math.floor(x0 * pixelRatio);
	const py0 = Math.floor(y0 * pixelRatio);
	const px1 = Math.ceil(x1 * pixelRatio);
	const py1 = Math.ceil(y1 * pixelRatio);
	return {
		pixelRatio,
		region: {
			x: px0 / pixelRatio,
			y: py0 / pixelRatio,
			width: (px1 - px0) / pixelRatio,
			height: (py1 - py0) / pixelRatio
		}
	};
}

export function isRenderingCancelled(err: unknown): boolean {
	return err instanceof Error && err.name === 'RenderingCancelledException';
}

/** Gives a canvas's memory back at once; Safari otherwise holds it until collection. */
export function releaseCanvas(canvas: HTMLCanvasElement): void {
	canvas.width = 0;
	canvas.height = 0;
}

/** A blank white sheet region, standing in for a sheet a revision does not have. */
export function blankCanvas(region: SheetRegion, pixelRatio: number): HTMLCanvasElement {
	const canvas = document.createElement('canvas');
	canvas.width = Math.max(1, Math.round(region.width * pixelRatio));
	canvas.height = Math.max(1, Math.round(region.height * pixelRatio));
	// Read back by the compare view, like pdf.js's own canvases.
	const context = canvas.getContext('2d', { willReadFrequently: true });
	if (context) {
		context.fillStyle = '#ffffff';
		context.fillRect(0, 0, canvas.width, canvas.height);
	}
	return canvas;
}

/**
 * One place on screen that shows one render at a time. pdf.js refuses a second render on a
 * canvas that is still busy, so a new request cancels the one in flight first; a cancelled
 * render resolves to null instead of throwing.
 */
export class RenderSlot {
	#task: RenderTask | null = null;

	async run(
		page: PDFPageProxy,
		region: SheetRegion,
		pixelRatio: number,
		target?: HTMLCanvasElement
	): Promise<HTMLCanvasElement | null> {
		this.cancel();
		const canvas = target ?? document.createElement('canvas');
		canvas.width = Math.max(1, Math.round(region.width * pixelRatio));
		canvas.height = Math.max(1, Math.round(region.height * pixelRatio));
		const task = page.render({
			canvas,
			viewport: sheetViewport(page),
			transform: [pixelRatio, 0, 0, pixelRatio, -region.x * pixelRatio, -region.y * pixelRatio]
		});
		this.#task = task;
		try {
			await task.promise;
			return canvas;
		} catch (err) {
			if (!target) releaseCanvas(canvas);
			if (isRenderingCancelled(err)) return null;
			throw err;
		} finally {
			if (this.#task === task) this.#task = null;
		}
	}

	cancel(): void {
		this.#task?.cancel();
		this.#task = null;
	}
}

/** Copies a finished offscreen render onto the canvas on screen in one step (no blank flash). */
export function showOn(target: HTMLCanvasElement, source: HTMLCanvasElement): void {
	target.width = source.width;
	target.height = source.height;
	target.getContext('2d')?.drawImage(source, 0, 0);
}

/** Places a canvas over the sheet region it was rendered for, in sheet units. */
export function placeOver(canvas: HTMLCanvasElement, region: SheetRegion): void {
	canvas.style.left = `${region.x}px`;
	canvas.style.top = `${region.y}px`;
	canvas.style.width = `${region.width}px`;
	canvas.style.height = `${region.height}px`;
}
