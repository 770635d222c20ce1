/**
 * What the closed outlines and straight lines of a page are, for reading labels: bubbles
 * (circles, ellipses, rounded boxes, hexagons and other small polygons, drawn as Béziers or
 * as polylines), weld dots, triangles, and the long straight rules tables are made of. Pure.
 */
import type { SheetShape } from './reader';
import { Grid, boxOfPoints, polygonArea, type Box, type Pt } from './plane';

export type OutlineKind = 'round' | 'rect' | 'polygon' | 'triangle' | 'other';

export interface Outline {
	kind: OutlineKind;
	pts: number[];
	box: Box;
	centre: Pt;
	area: number;
	dark: boolean;
	/** Drawn with a visible outline (a white fill alone is a mask behind text, not a bubble). */
	stroked: boolean;
}

export interface Line {
	a: Pt;
	b: Pt;
	length: number;
	/** Unit direction a → b. */
	u: Pt;
	box: Box;
}

/** Corners of a polyline outline: vertices where it turns by more than ~20°. */
function cornerCount(pts: number[]): number {
	const n = pts.length / 2;
	let corners = 0;
	for (let i = 0; i < n; i++) {
		const p = (i + n - 1) % n;
		const q = (i + 1) % n;
		const ax = pts[2 * i] - pts[2 * p];
		const ay = pts[2 * i + 1] - pts[2 * p + 1];
		const bx = pts[2 * q] - pts[2 * i];
		const by = pts[2 * q + 1] - pts[2 * i + 1];
		const la = Math.hypot(ax, ay);
		const lb = Math.hypot(bx, by);
		if (la < 1e-6 || lb < 1e-6) continue;
		if ((ax * bx + ay * by) / (la * lb) < 0.94) corners++;
	}
	return corners;
}

/** Whether the points keep an even distance from their centre, as a circle drawn as a polygon does. */
function isRoundish(pts: number[], centre: Pt, box: Box): boolean {
	const n = pts.length / 2;
	const rx = (box.x1 - box.x0) / 2;
	const ry = (box.y1 - box.y0) / 2;
	if (rx <= 0 || ry <= 0) return false;
	for (let i = 0; i < n; i++) {
		const dx = (pts[2 * i] - centre[0]) / rx;
		const dy = (pts[2 * i + 1] - centre[1]) / ry;
		const r = Math.hypot(dx, dy);
		if (r < 0.8 || r > 1.45) return false;
	}
	return true;
}

export function classifyOutline(shape: SheetShape): Outline | null {
	const pts = shape.pts;
	const n = pts.length / 2;
	if (n < 3) return null;
	const points: Pt[] = [];
	for (let i = 0; i < n; i++) points.push([pts[2 * i], pts[2 * i + 1]]);
	const box = boxOfPoints(points);
	const w = box.x1 - box.x0;
	const h = box.y1 - box.y0;
	if (w < 0.5 || h < 0.5) return null;
	const centre: Pt = [(box.x0 + box.x1) / 2, (box.y0 + box.y1) / 2];
	const area = polygonArea(pts);
	let kind: OutlineKind;
	if (shape.curves >= 2) kind = 'round';
	else {
		const corners = n <= 12 ? cornerCount(pts) : n;
		if (n >= 10 && isRoundish(pts, centre, box)) kind = 'round';
		else if (corners === 3) kind = 'triangle';
		else if (corners === 4 && n <= 6) {
			const rightAngled = area > 0.9 * w * h;
			kind = rightAngled ? 'rect' : 'polygon';
		} else if (corners >= 4 && corners <= 12) kind = 'polygon';
		else kind = 'other';
	}
	return { kind, pts, box, centre, area, dark: shape.dark, stroked: shape.stroke };
}

export function linesOf(segments: readonly number[]): Line[] {
	const lines: Line[] = [];
	for (let i = 0; i + 3 < segments.length; i += 4) {
		const a: Pt = [segments[i], segments[i + 1]];
		const b: Pt = [segments[i + 2], segments[i + 3]];
		const length = Math.hypot(b[0] - a[0], b[1] - a[1]);
		if (length < 0.4) continue;
		lines.push({
			a,
			b,
			length,
			u: [(b[0] - a[0]) / length, (b[1] - a[1]) / length],
			box: boxOfPoints([a, b])
		});
	}
	return lines;
}

export interface PageShapes {
	outlines: Outline[];
	outlineGrid: Grid<Outline>;
	lines: Line[];
	lineGrid: Grid<Line>;
	/** Horizontal and vertical rules (axis-aligned lines of some length), for tables. */
	rules: Grid<Line>;
}

export function pageShapes(shapes: readonly SheetShape[], segments: readonly number[]): PageShapes {
	const outlines: Outline[] = [];
	const outlineGrid = new Grid<Outline>(32);
	for (const shape of shapes) {
		const outline = classifyOutline(shape);
		if (!outline) continue;
		outlines.push(outline);
		outlineGrid.insert(outline, outline.box);
	}
	const lines = linesOf(segments);
	const lineGrid = new Grid<Line>(24);
	const rules = new Grid<Line>(48);
	for (const line of lines) {
		lineGrid.insert(line, line.box);
		const axial = Math.abs(line.u[0]) > 0.9995 || Math.abs(line.u[1]) > 0.9995;
		if (axial && line.length >= 4) rules.insert(line, line.box);
	}
	return { outlines, outlineGrid, lines, lineGrid, rules };
}
