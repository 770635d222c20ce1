/** The shapes the viewer pages receive from their loads, and the viewer's contract with pins. */
import type { SheetTiles } from '$lib/sheet-tiles';

export type RevisionStatus = 'current' | 'superseded';

export interface SheetBox {
	index: number;
	x0: number;
	y0: number;
	x1: number;
	y1: number;
	rotation: 0 | 90 | 180 | 270;
}

export interface ViewerRevision {
	id: number;
	label: string;
	status: RevisionStatus;
	issuedOn: string | null;
	note: string;
	pageCount: number;
	sha256: string;
	fileUrl: string;
	/** Size of the PDF, when known. */
	bytes?: number;
	pages: SheetBox[];
	/** Each sheet's tile pyramid, where the server has made one (queued ones too). */
	tiles?: SheetTiles[];
}

export interface RevisionChoice {
	id: number;
	label: string;
	status: RevisionStatus;
	issuedOn: string | null;
	uploadedAt: number;
}

export interface ViewerDrawing {
	id: number;
	number: string;
	title: string;
	kind: 'isometric' | 'shop' | 'structural';
	line: string;
	area: string;
	system: string;
}

export interface ViewerProject {
	id: number;
	code: string;
	name: string;
}

export interface DrawingSheetData {
	project: ViewerProject;
	drawing: ViewerDrawing;
	revision: ViewerRevision;
	revisions: RevisionChoice[];
	current: { id: number; label: string } | null;
}

export interface CompareData {
	project: ViewerProject;
	drawing: ViewerDrawing;
	revisions: RevisionChoice[];
	a: ViewerRevision;
	b: ViewerRevision;
}

/**
 * What the `overlay` snippet gets. It is rendered inside the sheet's SVG, whose user units are
 * sheet units: CSS pixels of the page at scale 1 with the page's /Rotate applied. The SVG is
 * scaled by panzoom together with the canvas, so anything drawn at `toViewport(x, y)` stays on
 * that PDF point at every zoom, pixel ratio and rotation.
 */
export interface SheetOverlayContext {
	/** Screen CSS pixels per sheet unit right now: draw a 24 px pin with radius `12 / scale`. */
	scale: number;
	/** PDF user-space point → sheet units (the SVG's coordinates). */
	toViewport: (x: number, y: number) => [number, number];
	/** Sheet units → PDF user-space point, as stored on a pin. */
	toPdf: (cx: number, cy: number) => [number, number];
	/** 0-based index of the sheet shown. */
	pageIndex: number;
}

/** A genuine tap or click on the sheet (not the end of a pan, pinch or double tap). */
export interface SheetTap {
	pageIndex: number;
	/** PDF user-space points (origin bottom-left of the unrotated page). */
	x: number;
	y: number;
	/** The element under the finger, e.g. a pin drawn by the overlay. */
	target: EventTarget | null;
}
