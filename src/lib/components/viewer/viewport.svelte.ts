/**
 * Zoom, pan and sheet number of one viewer, shared by the toolbar, the keyboard and the sheet.
 * panzoom owns the live transform; this class mirrors it for the interface and drives it.
 */
import type { PanZoom, Transform } from 'panzoom';

/** pdf.js's "100 %": one PDF point shown at 96 CSS pixels per inch. */
export const CSS_UNITS = 96 / 72;
/** 1200 %: a 2 mm weld-symbol note on an A0 sheet reads at about 60 px. */
const MAX_SCALE = 16;
const ZOOM_STEP = 1.25;
const FIT_MARGIN = 12;
/** How much of the sheet stays on screen however far it is dragged away. */
const KEEP_VISIBLE = 64;

export type FitMode = 'page' | 'width';

export class SheetViewport {
	scale = $state(1);
	x = $state(0);
	y = $state(0);
	/** The sheet in sheet units (PDF points, rotation applied). */
	sheetWidth = $state(0);
	sheetHeight = $state(0);
	/** The visible frame around the sheet, in CSS pixels. */
	frameWidth = $state(0);
	frameHeight = $state(0);
	pageNumber = $state(1);
	pageCount = $state(1);

	/** A sheet is open: its size is known and zoom and fit mean something. */
	readonly ready = $derived(this.sheetWidth > 0 && this.sheetHeight > 0);
	readonly zoomPercent = $derived(Math.round((this.scale / CSS_UNITS) * 100));
	readonly canZoomIn = $derived(this.scale < MAX_SCALE * 0.999);
	readonly canZoomOut = $derived(this.scale > this.minScale * 1.001);
	readonly hasNext = $derived(this.pageNumber < this.pageCount);
	readonly hasPrevious = $derived(this.pageNumber > 1);

	#panzoom: PanZoom | null = null;
	/** Kept while the view is exactly a fit, so turning the tablet fits again. */
	#fit: FitMode | null = 'page';
	#fitted: Transform | null = null;
	/** Where an animated zoom is heading, so quick presses add up instead of cutting it short. */
	#zoomTarget: number | null = null;

	/** The scale at which the whole sheet fits the frame (0 until both are known). */
	get fitPageScale(): number {
		return this.#fitScale('page');
	}

	get minScale(): number {
		const page = this.#fitScale('page');
		return page > 0 ? Math.min(page * 0.5, 1) : 0.05;
	}

	/** A new sheet surface (after a remount) takes over the view the old one left. */
	connect(panzoom: PanZoom): void {
		this.#panzoom = panzoom;
		this.#applyLimits();
		if (this.#fit) this.#refit();
		else {
			panzoom.zoomAbs(0, 0, this.scale);
			panzoom.moveTo(this.x, this.y);
		}
	}

	disconnect(): void {
		this.#panzoom = null;
	}

	/** Zooming and panning have come to rest. */
	settled(): void {
		this.#zoomTarget = null;
		this.keepInView();
	}

	/** Mirrors panzoom's transform; any move away from a fit ends "stay fitted". */
	follow(transform: Transform): void {
		this.scale = transform.scale;
		this.x = transform.x;
		this.y = transform.y;
		const fitted = this.#fitted;
		if (
			fitted &&
			(Math.abs(fitted.scale - transform.scale) > 1e-6 ||
				Math.abs(fitted.x - transform.x) > 0.5 ||
				Math.abs(fitted.y - transform.y) > 0.5)
		) {
			this.#fit = null;
			this.#fitted = null;
		}
	}

	/** A sheet of another size fits afresh; one of the same size keeps the zoom and position. */
	setSheet(width: number, height: number): void {
		const changed =
			Math.abs(width - this.sheetWidth) > 0.5 || Math.abs(height - this.sheetHeight) > 0.5;
		if (!changed) return;
		this.sheetWidth = width;
		this.sheetHeight = height;
		this.#fit ??= 'page';
		this.#applyLimits();
		this.#refit();
	}

	setFrame(width: number, height: number): void {
		if (width === this.frameWidth && height === this.frameHeight) return;
		this.frameWidth = width;
		this.frameHeight = height;
		this.#applyLimits();
		this.#refit();
	}

	fitPage(): void {
		this.#fit = 'page';
		this.#refit();
	}

	fitWidth(): void {
		this.#fit = 'width';
		this.#refit();
	}

	zoomIn(): void {
		this.#zoomAtCentre(ZOOM_STEP);
	}

	zoomOut(): void {
		this.#zoomAtCentre(1 / ZOOM_STEP);
	}

	/** Brings a sheet point to the middle of the frame, zoomed in to at least `scale`. */
	centerOn(sheetX: number, sheetY: number, scale = 2 * CSS_UNITS): void {
		const panzoom = this.#panzoom;
		if (!panzoom) return;
		const to = Math.min(MAX_SCALE, Math.max(panzoom.getTransform().scale, scale));
		this.#fit = null;
		this.#fitted = null;
		panzoom.zoomAbs(0, 0, to);
		panzoom.moveTo(this.frameWidth / 2 - sheetX * to, this.frameHeight / 2 - sheetY * to);
	}

	/** Pans by a share of the frame; positive moves the sheet right or down. */
	panBy(shareX: number, shareY: number): void {
		const step = Math.min(this.frameWidth, this.frameHeight);
		this.#panzoom?.moveBy(shareX * step, shareY * step, true);
	}

	/** Drags the sheet back when it has been flung (almost) out of sight. */
	keepInView(): void {
		const panzoom = this.#panzoom;
		if (!panzoom) return;
		const t = panzoom.getTransform();
		const width = this.sheetWidth * t.scale;
		const height = this.sheetHeight * t.scale;
		const keepX = Math.min(KEEP_VISIBLE, width);
		const keepY = Math.min(KEEP_VISIBLE, height);
		const x = Math.min(Math.max(t.x, keepX - width), this.frameWidth - keepX);
		const y = Math.min(Math.max(t.y, keepY - height), this.frameHeight - keepY);
		if (x !== t.x || y !== t.y) panzoom.smoothMoveTo(x, y);
	}

	goTo(pageNumber: number): void {
		if (!Number.isFinite(pageNumber)) return;
		this.pageNumber = Math.min(Math.max(1, Math.round(pageNumber)), Math.max(1, this.pageCount));
	}

	next(): void {
		this.goTo(this.pageNumber + 1);
	}

	previous(): void {
		this.goTo(this.pageNumber - 1);
	}

	/** The sheet point under a point given relative to the frame's top-left corner. */
	toSheet(frameX: number, frameY: number): [number, number] {
		const t = this.#panzoom?.getTransform() ?? { x: this.x, y: this.y, scale: this.scale };
		return [(frameX - t.x) / t.scale, (frameY - t.y) / t.scale];
	}

	#fitScale(mode: FitMode): number {
		if (this.sheetWidth <= 0 || this.frameWidth <= 0) return 0;
		const byWidth = (this.frameWidth - 2 * FIT_MARGIN) / this.sheetWidth;
		if (mode === 'width') return byWidth;
		return Math.min(byWidth, (this.frameHeight - 2 * FIT_MARGIN) / this.sheetHeight);
	}

	#applyLimits(): void {
		this.#panzoom?.setMinZoom(this.minScale);
		this.#panzoom?.setMaxZoom(MAX_SCALE);
	}

	#refit(): void {
		const panzoom = this.#panzoom;
		const mode = this.#fit;
		if (!panzoom || !mode || this.sheetWidth <= 0 || this.frameWidth <= 0) return;
		const scale = this.#fitScale(mode);
		if (scale <= 0) return;
		const x = (this.frameWidth - this.sheetWidth * scale) / 2;
		const y = mode === 'page' ? (this.frameHeight - this.sheetHeight * scale) / 2 : FIT_MARGIN;
		panzoom.zoomAbs(0, 0, scale);
		panzoom.moveTo(x, y);
		const t = panzoom.getTransform();
		this.#fitted = { x: t.x, y: t.y, scale: t.scale };
		this.#fit = mode;
	}

	#zoomAtCentre(factor: number): void {
		const panzoom = this.#panzoom;
		if (!panzoom) return;
		const from = this.#zoomTarget ?? panzoom.getTransform().scale;
		const to = Math.min(MAX_SCALE, Math.max(this.minScale, from * factor));
		this.#zoomTarget = to;
		panzoom.smoothZoomAbs(this.frameWidth / 2, this.frameHeight / 2, to);
	}
}
